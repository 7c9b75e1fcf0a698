import type { BenchView } from "./bench-view";
import type { CheckFinding, CheckSeverity } from "./check-finding";

/** Bounds the rules compare against; every field has a default in `defaultCheckOptions`. */
export interface CheckOptions {
  /** Expected line load above this share of capacity is a warning, percent. */
  readonly loadWarnPercent: number;
  /** Expected line load above this share of capacity is an error, percent. */
  readonly loadErrorPercent: number;
}

/**
 * 30 % / 60 %: common practice, no published source. The Basic course's bus-load
 * example already puts 8-9 telegrams/s near 20 %, and a line needs headroom for
 * bursts (scene recalls, start-up reads), so steady load is kept under a third.
 */
export const defaultCheckOptions: CheckOptions = { loadWarnPercent: 30, loadErrorPercent: 60 };

/** One rule of the bench check. */
export interface BenchCheckRule {
  readonly id: string;
  /** The severity its findings usually carry (a rule may grade a finding differently). */
  readonly severity: CheckSeverity;
  /** One line saying what the rule looks for. */
  readonly title: string;
  check(view: BenchView, options: CheckOptions): readonly CheckFinding[];
}
