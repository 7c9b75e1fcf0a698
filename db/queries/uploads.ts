import { createHash } from "node:crypto";
import { and, eq } from "drizzle-orm";
import { type Db, getDb } from "../client";
import { uploads } from "../schema";

export type Upload = typeof uploads.$inferSelect;

/** The file name a floor plan is stored under, from its image type. */
const floorPlanFileNames: Record<string, string> = {
  "image/png": "floor-plan.png",
  "image/jpeg": "floor-plan.jpg",
  "image/svg+xml": "floor-plan.svg",
};

function ofFloorPlan(workspaceId: string, benchId: string) {
  return and(
    eq(uploads.workspaceId, workspaceId),
    eq(uploads.benchId, benchId),
    eq(uploads.purpose, "floor-plan"),
  );
}

/** A bench's floor plan, only if the bench's upload belongs to the workspace. */
export function findFloorPlan({
  db = getDb(),
  workspaceId,
  benchId,
}: {
  db?: Db;
  workspaceId: string;
  benchId: string;
}): Upload | undefined {
  return db.select().from(uploads).where(ofFloorPlan(workspaceId, benchId)).get();
}

/**
 * Store a bench's floor plan, replacing the one before it in the same
 * transaction (a bench has at most one; the schema's unique index holds it to that).
 */
export function replaceFloorPlan({
  db = getDb(),
  workspaceId,
  benchId,
  uploadedBy,
  contentType,
  content,
}: {
  db?: Db;
  workspaceId: string;
  benchId: string;
  uploadedBy: string;
  contentType: string;
  content: Buffer;
}) {
  return db.transaction((tx) => {
    tx.delete(uploads).where(ofFloorPlan(workspaceId, benchId)).run();
    return tx
      .insert(uploads)
      .values({
        workspaceId,
        benchId,
        purpose: "floor-plan",
        uploadedBy,
        fileName: floorPlanFileNames[contentType] ?? "floor-plan",
        contentType,
        sizeBytes: content.byteLength,
        sha256: createHash("sha256").update(content).digest("hex"),
        content,
      })
      .returning({ id: uploads.id, sha256: uploads.sha256 })
      .get();
  });
}

/** Remove a bench's floor plan; true when there was one. */
export function removeFloorPlan({
  db = getDb(),
  workspaceId,
  benchId,
}: {
  db?: Db;
  workspaceId: string;
  benchId: string;
}): boolean {
  return db.delete(uploads).where(ofFloorPlan(workspaceId, benchId)).run().changes > 0;
}
