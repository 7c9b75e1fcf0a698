import { liveSessions } from "./live-session-registry";

let registered = false;

/**
 * Live sessions live in memory, so a stopping process ends them, and their
 * KNXnet/IP tunnels end the way the specification says: a DISCONNECT_REQUEST
 * to each client (KNX Standard 03_08_02 Core, "disconnect"; also ISO 22510).
 * Next's own SIGTERM/SIGINT handler exits the process a moment later; the
 * requests are handed to the socket synchronously before that, and the
 * `exit` hook covers any other way out. Viewers' streams get `ended`.
 */
export function endLiveSessionsOnExit(): void {
  if (registered) return;
  registered = true;
  const end = () => void liveSessions().shutdown();
  process.once("SIGTERM", end);
  process.once("SIGINT", end);
  process.once("exit", end);
}
