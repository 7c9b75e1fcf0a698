import { practiceCopyName } from "@/app/_lib/practice-copy-name";
import { sendJson } from "./api-client";

/**
 * Make the signed-in member's private practice copy of a bench through the
 * bench duplicate API (which applies the same rules as every other copy) and
 * return the new bench's id.
 */
export async function startPracticeCopy(bench: { id: string; name: string }): Promise<string> {
  const copy = await sendJson<{ bench: { id: string } }>(
    `/api/benches/${bench.id}/duplicate`,
    "POST",
    { name: practiceCopyName(bench.name), private: true },
  );
  return copy.bench.id;
}
