"use client";

import { useRouter } from "next/navigation";
import { useMemo, useState } from "react";
import { parseScenario } from "@/engine";
import { stepKinds, type StepKind } from "@/engine";
import { RunButton } from "@/components/runs/run-button";
import { Button } from "@/components/ui/button";
import { Mono } from "@/components/ui/mono";
import { DptValueField, dptValueProblem, JsonValueField } from "./dpt-value-field";
import { type FieldSpec, newStep, stepFields } from "./step-fields";

/** What the editor knows about the bench a scenario runs on. */
export interface EditorBench {
  readonly id: string;
  readonly name: string;
  readonly groupAddresses: readonly { address: string; name: string; dpt: string }[];
  readonly devices: readonly { id: string; name: string; type: string }[];
  readonly revisions: readonly { id: string; number: number }[];
}

type StepDraft = Record<string, unknown> & { kind: StepKind };
type Draft = Record<string, unknown> & { steps: StepDraft[] };

const inputClass = "w-full rounded-md border border-paper-line bg-white px-2 py-1.5 text-sm";

function asDraft(document: unknown): Draft {
  const base = (document && typeof document === "object" ? document : {}) as Record<
    string,
    unknown
  >;
  const steps = Array.isArray(base.steps) ? (base.steps as StepDraft[]) : [];
  return { ...base, steps };
}

/** Drop fields left empty in the form, so optional fields are absent rather than "". */
function cleaned(draft: Draft): Draft {
  const steps = draft.steps.map((step) => {
    const out: Record<string, unknown> = {};
    for (const [key, value] of Object.entries(step)) {
      if (value === "" || value === undefined) continue;
      out[key] = value;
    }
    return out as StepDraft;
  });
  return { ...draft, steps };
}

/** Parser issues keyed by where they point: "document" or "steps[2]" -> field -> message. */
function issuesByPlace(issues: readonly { path: string; message: string }[]) {
  const document: { path: string; message: string }[] = [];
  const steps = new Map<number, { field: string; message: string }[]>();
  for (const issue of issues) {
    const match = /^steps\[(\d+)\](?:\.(.+))?$/.exec(issue.path);
    if (match) {
      const index = Number(match[1]);
      const list = steps.get(index) ?? [];
      list.push({ field: match[2] ?? "", message: issue.message });
      steps.set(index, list);
    } else {
      document.push(issue);
    }
  }
  return { document, steps };
}

/**
 * The scenario editor: the document's settings, its steps as forms (one per
 * step kind, values edited for the address's DPT), drag (or ↑/↓) to reorder,
 * the engine's own parser messages beside the step and field they concern, a
 * raw JSON view of the same document, save, and Run now against a chosen
 * revision and seed.
 */
export function ScenarioEditor({
  scenarioId,
  initialDocument,
  bench,
  canEdit,
  canRun,
}: {
  scenarioId: string | null;
  initialDocument: unknown;
  bench: EditorBench;
  canEdit: boolean;
  canRun: boolean;
}) {
  const router = useRouter();
  const [draft, setDraft] = useState<Draft>(() => asDraft(initialDocument));
  const [view, setView] = useState<"form" | "json">("form");
  const [jsonText, setJsonText] = useState("");
  const [jsonError, setJsonError] = useState<string | null>(null);
  const [dirty, setDirty] = useState(scenarioId === null);
  const [saveState, setSaveState] = useState<
    { kind: "idle" | "saving" | "saved" } | { kind: "error"; message: string }
  >({
    kind: "idle",
  });
  const [dragging, setDragging] = useState<number | null>(null);
  const [addKind, setAddKind] = useState<StepKind>("write");
  const [seed, setSeed] = useState<string>("");
  const [revisionId, setRevisionId] = useState<string>("");

  const document = useMemo(() => cleaned(draft), [draft]);
  const parsed = useMemo(() => parseScenario(document), [document]);
  const issues = useMemo(() => issuesByPlace(parsed.ok ? [] : parsed.error.issues), [parsed]);
  const dptOf = useMemo(
    () => new Map(bench.groupAddresses.map((ga) => [ga.address, ga.dpt])),
    [bench],
  );

  const update = (next: Draft) => {
    setDraft(next);
    setDirty(true);
    setSaveState({ kind: "idle" });
  };
  const setStep = (index: number, step: StepDraft) =>
    update({ ...draft, steps: draft.steps.map((s, i) => (i === index ? step : s)) });
  const move = (from: number, to: number) => {
    if (to < 0 || to >= draft.steps.length || from === to) return;
    const steps = [...draft.steps];
    const [step] = steps.splice(from, 1);
    steps.splice(to, 0, step!);
    update({ ...draft, steps });
  };

  /** Bench-aware warnings the schema cannot know: unknown addresses, devices and DPT values. */
  const benchProblems = (step: StepDraft): { field: string; message: string }[] => {
    const out: { field: string; message: string }[] = [];
    const ga = typeof step.groupAddress === "string" ? step.groupAddress : "";
    if (ga && !dptOf.has(ga))
      out.push({ field: "groupAddress", message: `${ga} is not a group address of ${bench.name}` });
    for (const key of ["device", "from"]) {
      const id = step[key];
      if (
        typeof id === "string" &&
        id !== "" &&
        key === "from" &&
        !bench.devices.some((d) => d.id === id)
      ) {
        out.push({ field: key, message: `no device "${id}" on ${bench.name}` });
      }
    }
    if (
      ga &&
      (step.kind === "write" || step.kind === "expect-value" || step.kind === "expect-response")
    ) {
      const problem = dptValueProblem(dptOf.get(ga), step.value);
      if (problem) out.push({ field: "value", message: problem });
    }
    return out;
  };

  async function save(): Promise<boolean> {
    if (!parsed.ok) {
      setSaveState({ kind: "error", message: "fix the problems shown before saving" });
      return false;
    }
    setSaveState({ kind: "saving" });
    try {
      const response = await fetch(scenarioId ? `/api/scenarios/${scenarioId}` : "/api/scenarios", {
        method: scenarioId ? "PATCH" : "POST",
        headers: { "Content-Type": "application/json" },
        body: JSON.stringify(
          scenarioId
            ? { name: parsed.value.name, document }
            : { benchId: bench.id, name: parsed.value.name, document },
        ),
      });
      const body = (await response.json()) as {
        scenario?: { id: string };
        error?: { message: string };
      };
      if (!response.ok) {
        setSaveState({
          kind: "error",
          message: body.error?.message ?? `the server answered ${response.status}`,
        });
        return false;
      }
      setDirty(false);
      setSaveState({ kind: "saved" });
      if (!scenarioId && body.scenario) router.replace(`/scenarios/${body.scenario.id}`);
      else router.refresh();
      return true;
    } catch {
      setSaveState({ kind: "error", message: "could not reach the server" });
      return false;
    }
  }

  const switchView = (next: "form" | "json") => {
    if (next === "json") {
      setJsonText(JSON.stringify(document, null, 2));
      setJsonError(null);
    }
    setView(next);
  };

  const fieldEditor = (step: StepDraft, index: number, spec: FieldSpec) => {
    const id = `step-${index}-${spec.key}`;
    const value = step[spec.key];
    const set = (next: unknown) => setStep(index, { ...step, [spec.key]: next });
    const editor = spec.editor;
    if (editor === "group-address") {
      return (
        <select
          id={id}
          className={inputClass}
          value={typeof value === "string" ? value : ""}
          onChange={(e) => set(e.target.value)}
          disabled={!canEdit}
        >
          <option value="">{spec.optional ? "(none)" : "choose an address"}</option>
          {bench.groupAddresses.map((ga) => (
            <option key={ga.address} value={ga.address}>
              {ga.address} {ga.name} ({ga.dpt})
            </option>
          ))}
          {typeof value === "string" && value !== "" && !dptOf.has(value) ? (
            <option value={value}>{value} (not on this bench)</option>
          ) : null}
        </select>
      );
    }
    if (editor === "device") {
      return (
        <input
          id={id}
          className={inputClass}
          list={`devices-${bench.id}`}
          value={typeof value === "string" ? value : ""}
          onChange={(e) => set(e.target.value)}
          disabled={!canEdit}
        />
      );
    }
    if (editor === "dpt-value") {
      const ga = typeof step.groupAddress === "string" ? step.groupAddress : "";
      return (
        <DptValueField
          key={`${id}-${ga}`}
          id={id}
          dpt={dptOf.get(ga)}
          value={value}
          onChange={set}
          optional={spec.optional}
        />
      );
    }
    if (editor === "json") return <JsonValueField id={id} value={value} onChange={set} />;
    if (editor === "number" || editor === "integer") {
      return (
        <input
          id={id}
          type="number"
          step={editor === "integer" ? 1 : "any"}
          className={inputClass}
          value={typeof value === "number" ? value : ""}
          onChange={(e) => set(e.target.value === "" ? undefined : Number(e.target.value))}
          disabled={!canEdit}
        />
      );
    }
    if (typeof editor === "object") {
      return (
        <select
          id={id}
          className={inputClass}
          value={typeof value === "string" ? value : ""}
          onChange={(e) => set(e.target.value)}
          disabled={!canEdit}
        >
          {spec.optional ? <option value="">(default)</option> : null}
          {editor.choices.map((choice) => (
            <option key={choice} value={choice}>
              {choice}
            </option>
          ))}
        </select>
      );
    }
    return (
      <input
        id={id}
        className={inputClass}
        value={typeof value === "string" ? value : ""}
        onChange={(e) => set(e.target.value)}
        disabled={!canEdit}
        spellCheck={false}
      />
    );
  };

  const docString = (key: string) => (typeof draft[key] === "string" ? (draft[key] as string) : "");

  return (
    <div className="flex flex-col gap-5">
      <datalist id={`devices-${bench.id}`}>
        {bench.devices.map((d) => (
          <option key={d.id} value={d.id}>
            {d.name} ({d.type})
          </option>
        ))}
      </datalist>

      <div className="flex flex-wrap items-center justify-between gap-3">
        <div
          role="tablist"
          aria-label="Editor view"
          className="flex gap-1 rounded-md border border-paper-line p-1"
        >
          {(["form", "json"] as const).map((v) => (
            <button
              key={v}
              type="button"
              role="tab"
              aria-selected={view === v}
              onClick={() => switchView(v)}
              className={
                view === v
                  ? "rounded bg-copper px-3 py-1 text-sm text-white"
                  : "rounded px-3 py-1 text-sm"
              }
            >
              {v === "form" ? "Steps" : "Raw JSON"}
            </button>
          ))}
        </div>
        <div className="flex flex-wrap items-center gap-3">
          {canEdit ? (
            <Button
              onClick={() => void save()}
              disabled={saveState.kind === "saving" || !dirty}
              variant="secondary"
            >
              {scenarioId ? "Save" : "Create scenario"}
            </Button>
          ) : null}
          {saveState.kind === "saved" ? (
            <span role="status" className="text-sm text-teal">
              Saved.
            </span>
          ) : null}
          {saveState.kind === "error" ? (
            <span role="alert" className="text-sm text-fault">
              {saveState.message}
            </span>
          ) : null}
        </div>
      </div>

      {issues.document.length > 0 || (!parsed.ok && issues.steps.size > 0) ? (
        <div
          role="alert"
          aria-label="Problems"
          className="rounded-md bg-fault-soft p-3 text-sm text-fault"
        >
          <p className="font-medium">The scenario does not parse yet:</p>
          <ul className="mt-1 list-disc pl-5">
            {(parsed.ok ? [] : parsed.error.issues).map((issue, index) => (
              <li key={index}>
                <Mono>{issue.path}</Mono>: {issue.message}
              </li>
            ))}
          </ul>
        </div>
      ) : null}

      {view === "json" ? (
        <div className="flex flex-col gap-2">
          <label htmlFor="scenario-json" className="text-sm font-medium">
            Scenario document (JSON, format 1)
          </label>
          <textarea
            id="scenario-json"
            className="min-h-[28rem] rounded-md border border-paper-line bg-white p-3 font-mono text-xs"
            spellCheck={false}
            value={jsonText}
            readOnly={!canEdit}
            onChange={(e) => {
              setJsonText(e.target.value);
              try {
                update(asDraft(JSON.parse(e.target.value)));
                setJsonError(null);
              } catch (error) {
                setJsonError(`not valid JSON: ${(error as Error).message}`);
              }
            }}
          />
          {jsonError ? (
            <p role="alert" className="text-sm text-fault">
              {jsonError}
            </p>
          ) : null}
        </div>
      ) : (
        <>
          <fieldset className="grid gap-3 sm:grid-cols-2" disabled={!canEdit}>
            <label className="flex flex-col gap-1 text-sm">
              Name
              <input
                className={inputClass}
                value={docString("name")}
                onChange={(e) => update({ ...draft, name: e.target.value })}
              />
            </label>
            <label className="flex flex-col gap-1 text-sm">
              Settle time
              <input
                className={inputClass}
                value={docString("settle")}
                placeholder="1s"
                onChange={(e) => update({ ...draft, settle: e.target.value || undefined })}
              />
            </label>
            <label className="flex flex-col gap-1 text-sm sm:col-span-2">
              Description
              <textarea
                className={inputClass}
                rows={2}
                value={docString("description")}
                onChange={(e) => update({ ...draft, description: e.target.value || undefined })}
              />
            </label>
            <label className="flex items-center gap-2 text-sm">
              <input
                type="checkbox"
                checked={draft.expectedToFail === true}
                onChange={(e) => update({ ...draft, expectedToFail: e.target.checked })}
              />
              Expected to fail (a fault-finding exercise)
            </label>
          </fieldset>

          <ol className="flex flex-col gap-3" aria-label="Steps">
            {draft.steps.map((step, index) => {
              const stepIssues = [...(issues.steps.get(index) ?? []), ...benchProblems(step)];
              return (
                <li
                  key={index}
                  aria-label={`Step ${index + 1}: ${step.kind}`}
                  draggable={canEdit}
                  onDragStart={() => setDragging(index)}
                  onDragOver={(e) => e.preventDefault()}
                  onDrop={() => {
                    if (dragging !== null) move(dragging, index);
                    setDragging(null);
                  }}
                  onDragEnd={() => setDragging(null)}
                  className={`rounded-md border bg-white/50 p-3 ${dragging === index ? "border-copper opacity-60" : "border-paper-line"} ${stepIssues.length ? "border-l-4 border-l-fault" : ""}`}
                >
                  <div className="mb-2 flex flex-wrap items-center justify-between gap-2">
                    <span className="flex items-center gap-2 text-sm">
                      {canEdit ? (
                        <span
                          aria-hidden
                          className="cursor-grab select-none text-ink-soft"
                          title="Drag to reorder"
                        >
                          ⠿
                        </span>
                      ) : null}
                      <span className="text-ink-soft">#{index + 1}</span>
                      <select
                        aria-label={`Kind of step ${index + 1}`}
                        className="rounded-md border border-paper-line bg-white px-2 py-1 text-sm font-medium"
                        value={step.kind}
                        disabled={!canEdit}
                        onChange={(e) =>
                          setStep(index, {
                            ...newStep(e.target.value as StepKind),
                            label: step.label,
                          } as unknown as StepDraft)
                        }
                      >
                        {stepKinds.map((kind) => (
                          <option key={kind} value={kind}>
                            {kind}
                          </option>
                        ))}
                      </select>
                    </span>
                    {canEdit ? (
                      <span className="flex gap-1">
                        <Button
                          variant="secondary"
                          className="px-2 py-1"
                          aria-label={`Move step ${index + 1} up`}
                          onClick={() => move(index, index - 1)}
                          disabled={index === 0}
                        >
                          ↑
                        </Button>
                        <Button
                          variant="secondary"
                          className="px-2 py-1"
                          aria-label={`Move step ${index + 1} down`}
                          onClick={() => move(index, index + 1)}
                          disabled={index === draft.steps.length - 1}
                        >
                          ↓
                        </Button>
                        <Button
                          variant="secondary"
                          className="px-2 py-1"
                          aria-label={`Remove step ${index + 1}`}
                          onClick={() =>
                            update({ ...draft, steps: draft.steps.filter((_, i) => i !== index) })
                          }
                        >
                          Remove
                        </Button>
                      </span>
                    ) : null}
                  </div>
                  <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-3">
                    {(stepFields[step.kind] ?? []).map((spec) => {
                      const fieldIssues = stepIssues.filter((issue) => issue.field === spec.key);
                      return (
                        <div key={spec.key} className="flex flex-col gap-1 text-sm">
                          <label htmlFor={`step-${index}-${spec.key}`}>
                            {spec.label}
                            {spec.optional ? (
                              <span className="text-ink-soft"> (optional)</span>
                            ) : null}
                          </label>
                          {fieldEditor(step, index, spec)}
                          {spec.hint ? (
                            <span className="text-xs text-ink-soft">{spec.hint}</span>
                          ) : null}
                          {fieldIssues.map((issue, i) => (
                            <span key={i} role="alert" className="text-xs text-fault">
                              {issue.message}
                            </span>
                          ))}
                        </div>
                      );
                    })}
                  </div>
                  {stepIssues
                    .filter(
                      (issue) =>
                        !(stepFields[step.kind] ?? []).some((spec) => spec.key === issue.field),
                    )
                    .map((issue, i) => (
                      <p key={i} role="alert" className="mt-2 text-xs text-fault">
                        {issue.field ? `${issue.field}: ` : ""}
                        {issue.message}
                      </p>
                    ))}
                </li>
              );
            })}
          </ol>
          {canEdit ? (
            <div className="flex flex-wrap items-center gap-2">
              <select
                aria-label="Kind of new step"
                className="rounded-md border border-paper-line bg-white px-2 py-1.5 text-sm"
                value={addKind}
                onChange={(e) => setAddKind(e.target.value as StepKind)}
              >
                {stepKinds.map((kind) => (
                  <option key={kind} value={kind}>
                    {kind}
                  </option>
                ))}
              </select>
              <Button
                variant="secondary"
                onClick={() =>
                  update({
                    ...draft,
                    steps: [...draft.steps, newStep(addKind) as unknown as StepDraft],
                  })
                }
              >
                Add step
              </Button>
            </div>
          ) : null}
        </>
      )}

      {canRun && scenarioId ? (
        <section
          aria-label="Run"
          className="flex flex-col gap-3 rounded-lg border border-paper-line p-4"
        >
          <h2 className="text-sm font-semibold">Run on the server</h2>
          <div className="flex flex-wrap items-end gap-3">
            <label className="flex flex-col gap-1 text-sm">
              Bench revision
              <select
                className={inputClass}
                value={revisionId}
                onChange={(e) => setRevisionId(e.target.value)}
              >
                <option value="">latest</option>
                {bench.revisions.map((r) => (
                  <option key={r.id} value={r.id}>
                    revision {r.number}
                  </option>
                ))}
              </select>
            </label>
            <label className="flex flex-col gap-1 text-sm">
              Seed
              <input
                className={inputClass}
                type="number"
                min={0}
                placeholder={String(parsed.ok ? parsed.value.seed : 1)}
                value={seed}
                onChange={(e) => setSeed(e.target.value)}
              />
            </label>
          </div>
          <RunButton
            target={{ scenarioId }}
            seed={seed === "" ? undefined : Number(seed)}
            benchRevisionId={revisionId || undefined}
            beforeRun={canEdit && dirty ? save : undefined}
          />
        </section>
      ) : null}
    </div>
  );
}
