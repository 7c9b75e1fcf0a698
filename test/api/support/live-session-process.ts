/**
 * Child process of test/api/live-sessions-shutdown.test.ts: a server process
 * in miniature. It registers the shutdown hook as instrumentation.ts does,
 * starts and publishes a live session of the bench named on the command line
 * (database from DATABASE_URL, as the parent made it), and prints
 * "published <port>". Then it waits to be signalled.
 */
import { endLiveSessionsOnExit } from "../../../app/_lib/live/end-live-sessions-on-exit";
import { liveSessions } from "../../../app/_lib/live/live-session-registry";

const [benchId, userId, workspaceId] = process.argv.slice(2);
if (!benchId || !userId || !workspaceId)
  throw new Error("usage: live-session-process.ts <benchId> <userId> <workspaceId>");
process.env.KNXNET_PORTS = "0";
endLiveSessionsOnExit();
const who = { userId, workspaceId, role: "admin" as const, name: "Avery Admin" };
const session = liveSessions().start(who, { benchId });
const view = await liveSessions().publish(who, session.id);
process.stdout.write(`published ${view.endpoint!.port}\n`);
// Stays alive until the parent kills it; the SIGTERM hook sends the DISCONNECT_REQUESTs.
setInterval(() => undefined, 1000);
