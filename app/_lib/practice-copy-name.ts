const practiceSuffix = " (practice copy)";

/**
 * A practice copy's name, kept within the 120 characters a bench name may have.
 * Its own module because the console's client button names the copy too, and
 * the bench offers beside it read the database.
 */
export function practiceCopyName(benchName: string): string {
  return `${benchName.slice(0, 120 - practiceSuffix.length)}${practiceSuffix}`;
}
