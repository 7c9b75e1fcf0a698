import { z } from "zod";

/**
 * What the API says about one server-hosted live session (issue #17), shared
 * by the routes under app/api/live-sessions and the console that shows them.
 * Times are ISO 8601 wall-clock strings; addresses are dotted text.
 *
 * Routes (every one checks session and role itself):
 * - POST   /api/live-sessions                 { benchId, revision? } -> 201 { session }
 * - GET    /api/live-sessions                 -> 200 { sessions } (those the member may see)
 * - GET    /api/live-sessions/:id             -> 200 { session }
 * - DELETE /api/live-sessions/:id             -> 204 (stops it; tunnels get DISCONNECT_REQUEST)
 * - GET    /api/live-sessions/:id/events      -> text/event-stream: `message` events carry one
 *          SimMessage each (the full state first), `session` events a LiveSessionView when the
 *          endpoint or its clients change, `ended` { reason } once when the session ends
 * - POST   /api/live-sessions/:id/commands    SimCommand -> 202 { ok: true }
 * - POST   /api/live-sessions/:id/endpoint    -> 200 { session } (publish on KNXnet/IP)
 * - DELETE /api/live-sessions/:id/endpoint    -> 200 { session } (unpublish)
 * - DELETE /api/live-sessions/:id/endpoint/clients/:channelId -> 204
 *
 * Errors use the app's one error shape: { error: { code, message, field? } }.
 */

/** One tunnel connected to a published session. */
export const tunnelClientViewSchema = z.object({
  /** KNXnet/IP communication channel id, 1..255. */
  channelId: z.number().int().min(1).max(255),
  /** The client's IPv4 address and UDP port (its control endpoint as the datagram came). */
  address: z.string(),
  port: z.number().int().min(0).max(65535),
  /** The individual address the tunnel has on the bench's line, "1.1.250". */
  individualAddress: z.string(),
  connectedSince: z.iso.datetime(),
  /** L_Data.req taken from the client. */
  telegramsIn: z.number().int().nonnegative(),
  /** L_Data.ind sent to the client. */
  telegramsOut: z.number().int().nonnegative(),
});
export type TunnelClientView = z.infer<typeof tunnelClientViewSchema>;

/** A session's KNXnet/IP endpoint, when it is published. */
export const endpointViewSchema = z.object({
  address: z.string(),
  port: z.number().int().min(1).max(65535),
  /** False when bound to anything but the loopback interface: the console warns (no authentication). */
  loopback: z.boolean(),
  /** The endpoint's own individual address on the bench's line (device information), "1.1.240". */
  individualAddress: z.string(),
  clients: z.array(tunnelClientViewSchema),
});
export type EndpointView = z.infer<typeof endpointViewSchema>;

export const liveSessionViewSchema = z.object({
  id: z.string(),
  benchId: z.string(),
  benchName: z.string(),
  /** The bench revision number the session runs. */
  revision: z.number().int().min(1),
  owner: z.object({ memberId: z.string(), name: z.string() }),
  startedAt: z.iso.datetime(),
  /** Last viewer, command or tunnel activity. */
  lastActivityAt: z.iso.datetime(),
  /** When the session stops unless something happens before (idle time from LIVE_SESSION_IDLE_MINUTES). */
  idleStopAt: z.iso.datetime(),
  /** Whether the asking member may command, publish, disconnect clients and stop it (owner or admin). */
  canControl: z.boolean(),
  endpoint: endpointViewSchema.nullable(),
});
export type LiveSessionView = z.infer<typeof liveSessionViewSchema>;

/** Why a session ended, sent as the SSE `ended` event. */
export const liveSessionEndReasonSchema = z.enum([
  /** The owner (or an admin) stopped it. */
  "stopped",
  /** Nobody watched, commanded or tunnelled for the idle time. */
  "idle",
  /** The server process is stopping. */
  "shutdown",
]);
export type LiveSessionEndReason = z.infer<typeof liveSessionEndReasonSchema>;

export const liveSessionEndedEventSchema = z.object({ reason: liveSessionEndReasonSchema });
export type LiveSessionEndedEvent = z.infer<typeof liveSessionEndedEventSchema>;
