/** Where the console shows a session hosted by the server. */
export function serverSessionHref(sessionId: string): string {
  return `/console/sessions/${encodeURIComponent(sessionId)}`;
}
