import { z } from "zod";

// Only the lines are read here; the worker validates the whole bench and reports its errors.
const benchLinesSchema = z.object({
  lines: z.array(z.object({ id: z.string(), address: z.string(), name: z.string() })),
});

/**
 * Each line's label as people say it, "1.1 Lab room line" (its number, then
 * its name), by line id. The worker's bench summary carries only id and name,
 * so the page reads the numbers from the bench document it already holds.
 */
export function lineLabels(document: unknown): ReadonlyMap<string, string> {
  const parsed = benchLinesSchema.safeParse(document);
  if (!parsed.success) return new Map();
  return new Map(parsed.data.lines.map((line) => [line.id, `${line.address} ${line.name}`]));
}
