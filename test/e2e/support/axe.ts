import { AxeBuilder } from "@axe-core/playwright";
import type { Page } from "playwright-core";

/**
 * axe-core's WCAG 2.0/2.1/2.2 A and AA tags (axe-core rule descriptions,
 * https://github.com/dequelabs/axe-core/blob/develop/doc/rule-descriptions.md).
 */
export const WCAG_TAGS = ["wcag2a", "wcag2aa", "wcag21a", "wcag21aa", "wcag22aa"];

/**
 * Serious and critical violations on the page (or only inside `include`, a
 * CSS selector) as short lines: rule, impact, count and the first targets.
 */
export async function seriousViolations(page: Page, include?: string): Promise<string[]> {
  const builder = new AxeBuilder({ page }).withTags(WCAG_TAGS);
  const results = await (include === undefined ? builder : builder.include(include)).analyze();
  return results.violations
    .filter((v) => v.impact === "serious" || v.impact === "critical")
    .map(
      (v) =>
        `${v.id} (${v.impact}, ${v.nodes.length}): ${v.nodes
          .slice(0, 3)
          .map((n) => `${n.target.join(" ")} ${n.failureSummary?.split("\n")[1]?.trim() ?? ""}`)
          .join(" | ")}`,
    );
}
