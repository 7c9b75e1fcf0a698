/** Virtual time for people: "0:01:23.456" (hours:minutes:seconds.milliseconds). */
export function formatVirtualTime(timeUs: number): string {
  const totalMs = Math.floor(timeUs / 1000);
  const ms = totalMs % 1000;
  const totalS = Math.floor(totalMs / 1000);
  const s = totalS % 60;
  const m = Math.floor(totalS / 60) % 60;
  const h = Math.floor(totalS / 3600);
  return `${h}:${String(m).padStart(2, "0")}:${String(s).padStart(2, "0")}.${String(ms).padStart(3, "0")}`;
}
