/**
 * A practice copy's name. Its own module because the console's client button
 * needs it too, and bench-offers.ts reaches the database through the bench policy.
 */
const practiceSuffix = " (practice copy)";

/** A practice copy's name, kept within the 120 characters a bench name may have. */
export function practiceCopyName(benchName: string): string {
  return `${benchName.slice(0, 120 - practiceSuffix.length)}${practiceSuffix}`;
}
