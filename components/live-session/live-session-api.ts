import { liveSessionViewSchema, type LiveSessionView } from "@/app/_lib/live/live-session-view";
import { readApiError } from "@/components/sim/server-sim-client";

/** A refusal from the live-sessions API, with the field it names; shown as a form message. */
export class LiveSessionApiError extends Error {
  constructor(
    readonly status: number,
    message: string,
    readonly field?: string,
  ) {
    super(message);
    this.name = "LiveSessionApiError";
  }
}

const base = (sessionId: string) => `/api/live-sessions/${encodeURIComponent(sessionId)}`;

async function call(url: string, method: "POST" | "DELETE", body?: unknown): Promise<Response> {
  let response: Response;
  try {
    response = await fetch(url, {
      method,
      headers: {
        Accept: "application/json",
        ...(body === undefined ? {} : { "Content-Type": "application/json" }),
      },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
  } catch {
    throw new LiveSessionApiError(0, "the server could not be reached; try again");
  }
  if (!response.ok) {
    const error = await readApiError(response);
    throw new LiveSessionApiError(response.status, error.message, error.field);
  }
  return response;
}

/** The { session } an answer carries, checked: the console draws nothing it has not read. */
async function sessionOf(response: Response): Promise<LiveSessionView> {
  const body = (await response.json().catch(() => null)) as { session?: unknown } | null;
  const parsed = liveSessionViewSchema.safeParse(body?.session);
  if (!parsed.success)
    throw new LiveSessionApiError(response.status, "the server's answer could not be read");
  return parsed.data;
}

/** Starts a session of the bench's latest revision (or `revision`) on the server. */
export async function startLiveSession(benchId: string, revision?: number) {
  return sessionOf(
    await call("/api/live-sessions", "POST", {
      benchId,
      ...(revision === undefined ? {} : { revision }),
    }),
  );
}

/** Stops the session for everyone watching it; its tunnels are disconnected. */
export async function stopLiveSession(sessionId: string): Promise<void> {
  await call(base(sessionId), "DELETE");
}

/** Opens the session's KNXnet/IP tunnelling endpoint (owner only). */
export async function publishEndpoint(sessionId: string) {
  return sessionOf(await call(`${base(sessionId)}/endpoint`, "POST"));
}

/** Closes the endpoint; connected tunnels are disconnected. */
export async function unpublishEndpoint(sessionId: string) {
  return sessionOf(await call(`${base(sessionId)}/endpoint`, "DELETE"));
}

/** Disconnects one tunnel client by its channel id. */
export async function disconnectTunnel(sessionId: string, channelId: number): Promise<void> {
  await call(`${base(sessionId)}/endpoint/clients/${channelId}`, "DELETE");
}

/** The message a failed call shows. */
export function apiErrorText(error: unknown): string {
  return error instanceof LiveSessionApiError ? error.message : "something went wrong";
}
