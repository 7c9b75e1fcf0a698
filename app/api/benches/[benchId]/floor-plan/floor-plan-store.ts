import { createHash } from "node:crypto";
import { and, desc, eq } from "drizzle-orm";
import { type Db, getDb } from "@/db/client";
import { uploads } from "@/db/schema";

/**
 * Floor plans are kept in the uploads table (small files, in the database)
 * under the file name "floor-plan:<benchId>"; the latest upload wins and
 * older ones are removed with each new one.
 */
function floorPlanName(benchId: string): string {
  return `floor-plan:${benchId}`;
}

export function findFloorPlan({
  db = getDb(),
  workspaceId,
  benchId,
}: {
  db?: Db;
  workspaceId: string;
  benchId: string;
}) {
  return db
    .select()
    .from(uploads)
    .where(and(eq(uploads.workspaceId, workspaceId), eq(uploads.fileName, floorPlanName(benchId))))
    .orderBy(desc(uploads.createdAt))
    .limit(1)
    .get();
}

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
    tx.delete(uploads)
      .where(
        and(eq(uploads.workspaceId, workspaceId), eq(uploads.fileName, floorPlanName(benchId))),
      )
      .run();
    return tx
      .insert(uploads)
      .values({
        workspaceId,
        uploadedBy,
        fileName: floorPlanName(benchId),
        contentType,
        sizeBytes: content.byteLength,
        sha256: createHash("sha256").update(content).digest("hex"),
        content,
      })
      .returning({ id: uploads.id, sha256: uploads.sha256 })
      .get();
  });
}

export function removeFloorPlan({
  db = getDb(),
  workspaceId,
  benchId,
}: {
  db?: Db;
  workspaceId: string;
  benchId: string;
}) {
  db.delete(uploads)
    .where(and(eq(uploads.workspaceId, workspaceId), eq(uploads.fileName, floorPlanName(benchId))))
    .run();
}
