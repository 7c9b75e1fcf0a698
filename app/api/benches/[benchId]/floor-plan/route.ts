import { authorize, verifyApiSession } from "@/app/_lib/dal";
import { AppError } from "@/app/_lib/errors";
import {
  checkUtf8Charset,
  contentTypeOf,
  json,
  readBodyBytes,
  route,
  type RouteParams,
} from "@/app/_lib/http";
import { findReadableFloorPlan, loadFloorPlanBench } from "@/app/_lib/policy/upload";
import { resourceIdSchema } from "@/app/_lib/resources";
import { removeFloorPlan, replaceFloorPlan } from "@/db/queries/uploads";
import { sanitizeSvg } from "./sanitize-svg";

type Params = RouteParams<{ benchId: string }>;

/** Largest floor-plan image accepted. */
export const FLOOR_PLAN_LIMIT_BYTES = 2 * 1024 * 1024;

const imageTypes = ["image/png", "image/jpeg", "image/svg+xml"] as const;

async function benchIdOf(context: Params) {
  const parsed = resourceIdSchema.safeParse((await context.params).benchId);
  if (!parsed.success) throw new AppError("not_found", "no such bench");
  return parsed.data;
}

// The file's own first bytes must agree with its declared type (PNG and JPEG signatures).
function matchesSignature(type: string, bytes: Buffer): boolean {
  if (type === "image/png")
    return bytes
      .subarray(0, 8)
      .equals(Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]));
  if (type === "image/jpeg") return bytes[0] === 0xff && bytes[1] === 0xd8 && bytes[2] === 0xff;
  return true;
}

/**
 * What a floor plan is served with. The route's own policy: the file is an
 * image, never a document that runs anything, even opened directly in a tab
 * (no script, nothing fetched, sandboxed). next.config.ts leaves these headers
 * to this route.
 */
function floorPlanHeaders(contentType: string, sha256: string): HeadersInit {
  const extension = contentType === "image/svg+xml" ? "svg" : contentType.slice(6);
  return {
    "Content-Type": contentType,
    "Content-Security-Policy": "default-src 'none'; style-src 'unsafe-inline'; sandbox",
    "Content-Disposition": `inline; filename="floor-plan.${extension}"`,
    "X-Content-Type-Options": "nosniff",
    "Cache-Control": "private, no-cache",
    ETag: `"${sha256}"`,
  };
}

/** The bench's floor plan image; SVG is served inert (no script, nothing fetched). */
export const GET = route(async (request, context: Params) => {
  const benchId = await benchIdOf(context);
  const session = await verifyApiSession(request);
  authorize(session, "benches.read");
  const bench = loadFloorPlanBench(session, benchId);
  const plan = findReadableFloorPlan(session, bench);
  if (!plan) throw new AppError("not_found", "this bench has no floor plan");
  return new Response(new Uint8Array(plan.content), {
    headers: floorPlanHeaders(plan.contentType, plan.sha256),
  });
});

/**
 * Upload a floor plan: the body is the image itself, PNG, JPEG or SVG
 * (sanitised), at most 2 MiB. The session and the member's right to edit the
 * bench are checked before a byte of the body is read.
 */
export const PUT = route(async (request, context: Params) => {
  const benchId = await benchIdOf(context);
  const { type } = contentTypeOf(request);
  if (!(imageTypes as readonly string[]).includes(type)) {
    throw new AppError(
      "unsupported_media_type",
      `a floor plan is PNG, JPEG or SVG (got ${type ? `"${type.slice(0, 80)}"` : "no content type"})`,
      { field: "file" },
    );
  }
  if (type === "image/svg+xml") checkUtf8Charset(request);
  const session = await verifyApiSession(request);
  const bench = loadFloorPlanBench(session, benchId, "edit");
  const bytes = Buffer.from(
    await readBodyBytes(request, FLOOR_PLAN_LIMIT_BYTES, {
      field: "file",
      tooLarge: `a floor plan is at most ${FLOOR_PLAN_LIMIT_BYTES / 1024 / 1024} MiB`,
    }),
  );
  if (bytes.byteLength === 0)
    throw new AppError("invalid_input", "the file is empty", { field: "file" });
  if (!matchesSignature(type, bytes))
    throw new AppError("invalid_input", `the file is not a ${type.slice(6).toUpperCase()} image`, {
      field: "file",
    });
  let content = bytes;
  let removed: readonly string[] = [];
  if (type === "image/svg+xml") {
    let text: string;
    try {
      text = new TextDecoder("utf-8", { fatal: true }).decode(bytes);
    } catch {
      throw new AppError("invalid_input", "the SVG is not valid UTF-8 text", { field: "file" });
    }
    const sanitized = await sanitizeSvg(text);
    if ("refused" in sanitized)
      throw new AppError("invalid_input", `file: ${sanitized.refused}`, { field: "file" });
    content = Buffer.from(sanitized.svg, "utf8");
    removed = sanitized.removed;
  }
  const stored = replaceFloorPlan({
    workspaceId: session.workspaceId,
    benchId: bench.id,
    uploadedBy: session.userId,
    contentType: type,
    content,
  });
  return json(
    {
      floorPlan: {
        url: `/api/benches/${bench.id}/floor-plan?v=${stored.sha256.slice(0, 12)}`,
        removed,
      },
    },
    { status: 201 },
  );
});

/** Remove the bench's floor plan. */
export const DELETE = route(async (request, context: Params) => {
  const benchId = await benchIdOf(context);
  const session = await verifyApiSession(request);
  const bench = loadFloorPlanBench(session, benchId, "edit");
  removeFloorPlan({ workspaceId: session.workspaceId, benchId: bench.id });
  return new Response(null, { status: 204, headers: { "Cache-Control": "no-store" } });
});
