import { sql } from "drizzle-orm";
import {
  type AnySQLiteColumn,
  blob,
  check,
  index,
  integer,
  sqliteTable,
  text,
  uniqueIndex,
} from "drizzle-orm/sqlite-core";

/**
 * The whole Benchline database. Row types are only ever derived from these
 * tables (`typeof users.$inferSelect` / `$inferInsert`), never written by hand,
 * so a column change shows up everywhere the row is used.
 *
 * Conventions:
 * - ids are random UUID strings (not guessable, safe to put in URLs);
 * - times are integer milliseconds since the epoch, read back as `Date`;
 * - JSON documents (bench, scenario, run results) are stored as text and
 *   validated with the engine's zod schemas when read, never trusted as typed;
 * - everything that belongs to a workspace carries `workspaceId`, so every query
 *   can (and must) filter by it: data never crosses workspaces.
 */

/** The five roles a member can hold in one workspace; the order is not a ranking. */
export const roles = ["admin", "trainer", "engineer", "qa", "apprentice"] as const;
export type Role = (typeof roles)[number];

export const runStatuses = ["queued", "running", "finished", "errored"] as const;
export type RunStatus = (typeof runStatuses)[number];

export const runVerdicts = ["pass", "fail", "error"] as const;
export type RunVerdict = (typeof runVerdicts)[number];

export const outboxStatuses = ["pending", "sent", "failed"] as const;
export type OutboxStatus = (typeof outboxStatuses)[number];

/**
 * Whom a mail concerns. "workspace" mail is sent on a workspace's behalf
 * (invitations, shared run reports, lab assignments) and its admins may read
 * it on the Outbox page; "account" mail (password resets, sign-in notices)
 * concerns one person's account, belongs to no workspace and is never shown
 * to anyone but its addressee.
 */
export const mailAudiences = ["workspace", "account"] as const;
export type MailAudience = (typeof mailAudiences)[number];

/** What an upload is for; an upload with a purpose belongs to one bench. */
export const uploadPurposes = ["floor-plan"] as const;
export type UploadPurpose = (typeof uploadPurposes)[number];

const id = () =>
  text("id")
    .primaryKey()
    .$defaultFn(() => crypto.randomUUID());

/** A time the row is given when it is written, unless the insert sets one. */
const timestampNow = (name: string) =>
  integer(name, { mode: "timestamp_ms" })
    .notNull()
    .$defaultFn(() => new Date());

const createdAt = () => timestampNow("created_at");

const updatedAt = () => timestampNow("updated_at");

const timestamp = (name: string) => integer(name, { mode: "timestamp_ms" });

const inList = (column: string, values: readonly string[]) =>
  sql.raw(`${column} in (${values.map((v) => `'${v}'`).join(", ")})`);

// ---------------------------------------------------------------- people

export const workspaces = sqliteTable("workspaces", {
  id: id(),
  /** URL-safe short name, unique, e.g. "fernhill". */
  slug: text("slug").notNull().unique(),
  name: text("name").notNull(),
  createdAt: createdAt(),
});

/** The workspace a row belongs to; deleting the workspace deletes the row. */
const workspaceId = () =>
  text("workspace_id")
    .notNull()
    .references(() => workspaces.id, { onDelete: "cascade" });

export const users = sqliteTable("users", {
  id: id(),
  /** Stored lower-cased; unique across the whole installation. */
  email: text("email").notNull().unique(),
  name: text("name").notNull(),
  /** bcrypt hash; the plain password is never stored. */
  passwordHash: text("password_hash").notNull(),
  /**
   * Bumped on password change, sign-out-everywhere or disable; a session cookie
   * that carries an older number is refused, so stale sessions die at once.
   */
  sessionVersion: integer("session_version").notNull().default(0),
  /** Set when an admin disables the account; a disabled user cannot sign in. */
  disabledAt: timestamp("disabled_at"),
  createdAt: createdAt(),
});

/** The user who did something to a row (created, started, reviewed it); the row outlives the account. */
const actingUserId = (column: string) =>
  text(column).references(() => users.id, { onDelete: "set null" });

export const memberships = sqliteTable(
  "memberships",
  {
    id: id(),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    workspaceId: workspaceId(),
    role: text("role", { enum: roles }).notNull(),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex("memberships_user_workspace_unique").on(t.userId, t.workspaceId),
    index("memberships_workspace_idx").on(t.workspaceId),
    check("memberships_role_check", inList("role", roles)),
  ],
);

export const invitations = sqliteTable(
  "invitations",
  {
    id: id(),
    workspaceId: workspaceId(),
    email: text("email").notNull(),
    role: text("role", { enum: roles }).notNull(),
    /** SHA-256 of the token sent by e-mail; the token itself is never stored. */
    tokenHash: text("token_hash").notNull().unique(),
    invitedBy: text("invited_by")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    expiresAt: timestamp("expires_at").notNull(),
    acceptedAt: timestamp("accepted_at"),
    revokedAt: timestamp("revoked_at"),
    createdAt: createdAt(),
  },
  (t) => [
    index("invitations_workspace_idx").on(t.workspaceId),
    check("invitations_role_check", inList("role", roles)),
  ],
);

export const passwordResets = sqliteTable(
  "password_resets",
  {
    id: id(),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    /** SHA-256 of the token sent by e-mail. */
    tokenHash: text("token_hash").notNull().unique(),
    expiresAt: timestamp("expires_at").notNull(),
    usedAt: timestamp("used_at"),
    createdAt: createdAt(),
  },
  (t) => [index("password_resets_user_idx").on(t.userId)],
);

/** One row per sign-in attempt, kept for rate limiting by e-mail and by client address. */
export const loginAttempts = sqliteTable(
  "login_attempts",
  {
    id: id(),
    email: text("email").notNull(),
    clientAddress: text("client_address"),
    succeeded: integer("succeeded", { mode: "boolean" }).notNull(),
    createdAt: createdAt(),
  },
  (t) => [
    index("login_attempts_email_time_idx").on(t.email, t.createdAt),
    index("login_attempts_client_time_idx").on(t.clientAddress, t.createdAt),
  ],
);

// ---------------------------------------------------------------- benches and scenarios

export const benches = sqliteTable(
  "benches",
  {
    id: id(),
    workspaceId: workspaceId(),
    name: text("name").notNull(),
    description: text("description").notNull().default(""),
    createdBy: actingUserId("created_by"),
    /**
     * Set for a private copy (an apprentice's sandbox or lab copy): only this
     * user and the workspace's trainers and admins see it.
     */
    privateOwnerId: text("private_owner_id").references(() => users.id, { onDelete: "cascade" }),
    /** The bench this one was copied from, if any. */
    copiedFromBenchId: text("copied_from_bench_id").references((): AnySQLiteColumn => benches.id, {
      onDelete: "set null",
    }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
    archivedAt: timestamp("archived_at"),
  },
  (t) => [
    index("benches_workspace_idx").on(t.workspaceId),
    index("benches_private_owner_idx").on(t.privateOwnerId),
  ],
);

/** Every save of a bench is a new immutable revision; runs point at the revision they ran. */
export const benchRevisions = sqliteTable(
  "bench_revisions",
  {
    id: id(),
    benchId: text("bench_id")
      .notNull()
      .references(() => benches.id, { onDelete: "cascade" }),
    /** 1, 2, 3 ... per bench. */
    number: integer("number").notNull(),
    /** The bench document as JSON text, in the engine's bench format. */
    document: text("document").notNull(),
    authorId: actingUserId("author_id"),
    summary: text("summary").notNull().default(""),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("bench_revisions_bench_number_unique").on(t.benchId, t.number)],
);

export const scenarios = sqliteTable(
  "scenarios",
  {
    id: id(),
    workspaceId: workspaceId(),
    benchId: text("bench_id")
      .notNull()
      .references(() => benches.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    /** The scenario document as JSON text, in the engine's scenario format. */
    document: text("document").notNull(),
    createdBy: actingUserId("created_by"),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    index("scenarios_workspace_idx").on(t.workspaceId),
    index("scenarios_bench_idx").on(t.benchId),
  ],
);

export const suites = sqliteTable(
  "suites",
  {
    id: id(),
    workspaceId: workspaceId(),
    name: text("name").notNull(),
    description: text("description").notNull().default(""),
    createdBy: actingUserId("created_by"),
    createdAt: createdAt(),
  },
  (t) => [index("suites_workspace_idx").on(t.workspaceId)],
);

/** The ordered scenarios of a suite. */
export const suiteScenarios = sqliteTable(
  "suite_scenarios",
  {
    suiteId: text("suite_id")
      .notNull()
      .references(() => suites.id, { onDelete: "cascade" }),
    scenarioId: text("scenario_id")
      .notNull()
      .references(() => scenarios.id, { onDelete: "cascade" }),
    position: integer("position").notNull(),
  },
  (t) => [
    uniqueIndex("suite_scenarios_suite_scenario_unique").on(t.suiteId, t.scenarioId),
    index("suite_scenarios_suite_position_idx").on(t.suiteId, t.position),
  ],
);

// ---------------------------------------------------------------- runs

/**
 * One replay of a suite: a parent of one `runs` row per scenario, so history,
 * diffs and reports per scenario read the same rows whether the scenario ran
 * alone or in a suite. `benchRevisionId` is set when the person forced every
 * scenario onto one revision; otherwise each ran on its bench's latest.
 */
export const suiteRuns = sqliteTable(
  "suite_runs",
  {
    id: id(),
    workspaceId: workspaceId(),
    suiteId: text("suite_id").references(() => suites.id, { onDelete: "set null" }),
    /** The suite's name when it ran, kept for history after a rename or delete. */
    suiteName: text("suite_name").notNull(),
    benchRevisionId: text("bench_revision_id").references(() => benchRevisions.id, {
      onDelete: "restrict",
    }),
    /** Seed forced on every scenario, or null when each used its own document's seed. */
    seed: integer("seed"),
    status: text("status", { enum: runStatuses }).notNull().default("queued"),
    verdict: text("verdict", { enum: runVerdicts }),
    scenariosTotal: integer("scenarios_total").notNull().default(0),
    scenariosDone: integer("scenarios_done").notNull().default(0),
    /** Scenarios whose outcome counts as passing (passed, or failed as expected). */
    scenariosOk: integer("scenarios_ok").notNull().default(0),
    startedBy: actingUserId("started_by"),
    createdAt: createdAt(),
    startedAt: timestamp("started_at"),
    finishedAt: timestamp("finished_at"),
    /** Wall-clock milliseconds from the first scenario starting to the last finishing. */
    durationMs: integer("duration_ms"),
  },
  (t) => [
    index("suite_runs_workspace_time_idx").on(t.workspaceId, t.createdAt),
    check("suite_runs_status_check", inList("status", runStatuses)),
  ],
);

/** One replay of a scenario (or a suite) against one bench revision with one seed. */
export const runs = sqliteTable(
  "runs",
  {
    id: id(),
    workspaceId: workspaceId(),
    scenarioId: text("scenario_id").references(() => scenarios.id, { onDelete: "set null" }),
    suiteId: text("suite_id").references(() => suites.id, { onDelete: "set null" }),
    benchRevisionId: text("bench_revision_id")
      .notNull()
      .references(() => benchRevisions.id, { onDelete: "restrict" }),
    /** Seed of the engine's generator; same bench revision + scenario + seed = same trace. */
    seed: integer("seed").notNull(),
    status: text("status", { enum: runStatuses }).notNull().default("queued"),
    verdict: text("verdict", { enum: runVerdicts }),
    stepsPassed: integer("steps_passed").notNull().default(0),
    stepsFailed: integer("steps_failed").notNull().default(0),
    stepsTotal: integer("steps_total").notNull().default(0),
    /** Per-step verdicts with their trace slices, as JSON text. */
    results: text("results"),
    startedBy: actingUserId("started_by"),
    createdAt: createdAt(),
    startedAt: timestamp("started_at"),
    finishedAt: timestamp("finished_at"),
    /** The suite run this scenario run belongs to, if it ran in a suite. */
    suiteRunId: text("suite_run_id").references((): AnySQLiteColumn => suiteRuns.id, {
      onDelete: "cascade",
    }),
    /** Position in the suite run, from 0. */
    position: integer("position").notNull().default(0),
    /** The scenario's name when it ran, kept for history after a rename or delete. */
    scenarioName: text("scenario_name").notNull().default(""),
    /** The scenario document that ran (JSON text), so a report and a re-run need nothing else. */
    scenarioDocument: text("scenario_document"),
    /** Wall-clock milliseconds the runner took. */
    durationMs: integer("duration_ms"),
    /** Why the run could not finish (bench did not load, worker failed). */
    errorMessage: text("error_message"),
  },
  (t) => [
    index("runs_workspace_time_idx").on(t.workspaceId, t.createdAt),
    index("runs_suite_run_idx").on(t.suiteRunId),
    index("runs_scenario_idx").on(t.scenarioId),
    index("runs_started_by_idx").on(t.startedBy),
    check("runs_status_check", inList("status", runStatuses)),
  ],
);

// ---------------------------------------------------------------- files and mail

/**
 * Files members upload (bench or scenario JSON to import, a bench's floor-plan
 * image); small, so kept in the database.
 */
export const uploads = sqliteTable(
  "uploads",
  {
    id: id(),
    workspaceId: workspaceId(),
    uploadedBy: actingUserId("uploaded_by"),
    /** The bench the file belongs to (a floor plan); goes with the bench. */
    benchId: text("bench_id").references(() => benches.id, { onDelete: "cascade" }),
    /** What the file is for on its bench; null for a plain upload. */
    purpose: text("purpose", { enum: uploadPurposes }),
    fileName: text("file_name").notNull(),
    contentType: text("content_type").notNull(),
    sizeBytes: integer("size_bytes").notNull(),
    sha256: text("sha256").notNull(),
    content: blob("content", { mode: "buffer" }).notNull(),
    createdAt: createdAt(),
  },
  (t) => [
    index("uploads_workspace_idx").on(t.workspaceId),
    index("uploads_bench_idx").on(t.benchId),
    // A bench has at most one floor plan: a new one replaces the old in one transaction.
    uniqueIndex("uploads_bench_floor_plan_unique")
      .on(t.benchId)
      .where(sql.raw("purpose = 'floor-plan'")),
    check("uploads_purpose_check", inList("purpose", uploadPurposes)),
    // A purpose only means something on a bench.
    check("uploads_purpose_bench_check", sql.raw("purpose is null or bench_id is not null")),
  ],
);

/**
 * Mail is written here in the same transaction as the change that causes it
 * (invitation, password reset) and sent afterwards, so a failing mail server
 * never loses or duplicates a message. The Outbox page lists a workspace's own
 * mail; account mail has no workspace (the check below holds it to that), and
 * its body is blanked once it has been delivered.
 */
export const emailOutbox = sqliteTable(
  "email_outbox",
  {
    id: id(),
    /** Set exactly for workspace mail; null for account mail. */
    workspaceId: text("workspace_id").references(() => workspaces.id, { onDelete: "cascade" }),
    audience: text("audience", { enum: mailAudiences }).notNull().default("workspace"),
    toAddress: text("to_address").notNull(),
    subject: text("subject").notNull(),
    textBody: text("text_body").notNull(),
    htmlBody: text("html_body"),
    /** What caused the mail, e.g. "invitation", "password-reset". */
    purpose: text("purpose").notNull(),
    status: text("status", { enum: outboxStatuses }).notNull().default("pending"),
    attempts: integer("attempts").notNull().default(0),
    lastError: text("last_error"),
    createdAt: createdAt(),
    sentAt: timestamp("sent_at"),
  },
  (t) => [
    index("email_outbox_status_idx").on(t.status, t.createdAt),
    check("email_outbox_status_check", inList("status", outboxStatuses)),
    check("email_outbox_audience_check", inList("audience", mailAudiences)),
    // Account mail never belongs to a workspace; workspace mail always does.
    check(
      "email_outbox_audience_workspace_check",
      sql.raw(
        "(audience = 'account' and workspace_id is null) or (audience = 'workspace' and workspace_id is not null)",
      ),
    ),
  ],
);

// ---------------------------------------------------------------- training labs

/** A lab: a bench with faults to find, and the scenario that grades an apprentice's fix. */
export const labs = sqliteTable(
  "labs",
  {
    id: id(),
    workspaceId: workspaceId(),
    title: text("title").notNull(),
    brief: text("brief").notNull().default(""),
    benchId: text("bench_id")
      .notNull()
      .references(() => benches.id, { onDelete: "restrict" }),
    gradingScenarioId: text("grading_scenario_id")
      .notNull()
      .references(() => scenarios.id, { onDelete: "restrict" }),
    /**
     * Faults the trainer hid in the apprentices' copies, as JSON text (a list of
     * edits to the bench document, see app/_lib/labs/hidden-faults.ts).
     */
    hiddenFaults: text("hidden_faults").notNull().default("[]"),
    createdBy: actingUserId("created_by"),
    createdAt: createdAt(),
    archivedAt: timestamp("archived_at"),
  },
  (t) => [index("labs_workspace_idx").on(t.workspaceId)],
);

/** A lab handed to one apprentice, who works on a private copy of the lab bench. */
export const labAssignments = sqliteTable(
  "lab_assignments",
  {
    id: id(),
    labId: text("lab_id")
      .notNull()
      .references(() => labs.id, { onDelete: "cascade" }),
    apprenticeId: text("apprentice_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    assignedBy: actingUserId("assigned_by"),
    dueAt: timestamp("due_at"),
    /** The apprentice's private copy of the lab bench, made when the lab is first opened. */
    privateBenchId: text("private_bench_id").references(() => benches.id, {
      onDelete: "set null",
    }),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex("lab_assignments_lab_apprentice_unique").on(t.labId, t.apprenticeId),
    index("lab_assignments_apprentice_idx").on(t.apprenticeId),
  ],
);

/** One submission of an assignment: the submitted bench revision and the grading run. */
export const labAttempts = sqliteTable(
  "lab_attempts",
  {
    id: id(),
    assignmentId: text("assignment_id")
      .notNull()
      .references(() => labAssignments.id, { onDelete: "cascade" }),
    benchRevisionId: text("bench_revision_id")
      .notNull()
      .references(() => benchRevisions.id, { onDelete: "restrict" }),
    runId: text("run_id").references(() => runs.id, { onDelete: "set null" }),
    submittedAt: timestampNow("submitted_at"),
    /** Trainer's note when reviewing. */
    reviewNote: text("review_note"),
    reviewedBy: actingUserId("reviewed_by"),
    reviewedAt: timestamp("reviewed_at"),
  },
  (t) => [index("lab_attempts_assignment_idx").on(t.assignmentId)],
);
