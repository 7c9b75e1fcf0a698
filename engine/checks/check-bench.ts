import type { Bench } from "../bench/bench-schema";
import {
  addressMixedSizesRule,
  addressNoListenerRule,
  addressNoSenderRule,
  addressUnlinkedRule,
} from "./address-rules";
import { defaultCheckOptions, type BenchCheckRule, type CheckOptions } from "./bench-check-rule";
import { benchView } from "./bench-view";
import { compareFindings, type CheckFinding } from "./check-finding";
import {
  deviceDuplicateIndividualAddressRule,
  deviceParametersInvalidRule,
  deviceUnknownTypeRule,
} from "./device-rules";
import { addressDptMeaningRule } from "./dpt-meaning";
import {
  controllerNoUnitRule,
  controllerSeveralUnitsRule,
  gatewayExternalTemperatureOnSecondaryRule,
  gatewayMultiSplitWithoutOutdoorUnitRule,
  gatewaySingleSplitOnOutdoorUnitRule,
  indoorUnitNoControllerRule,
  indoorUnitNoPrimaryRule,
  indoorUnitSeveralOutdoorUnitsRule,
  indoorUnitTwoPrimariesRule,
  outdoorUnitLeaderNotMemberRule,
} from "./hvac-rules";
import { lineExpectedLoadRule } from "./line-load";
import {
  topologyAddressWrongLineRule,
  topologyFilterBlocksRule,
  topologyFilterUnusedRule,
  topologyLineLimitsRule,
} from "./topology-rules";
import { objectStatusOnCommandAddressRule, objectStatusUnlinkedRule } from "./object-rules";
import { panelPresetOutOfRangeRule } from "./panel-rules";
import { addressSeveralReadRespondersRule, objectReadOnInitUnansweredRule } from "./read-rules";

/**
 * Every rule, in the order the documentation lists them. Rules look at what a
 * schema cannot: several objects, devices or links together. What one device's
 * parameters get wrong on their own (inverted setpoint limits, a scene number
 * outside 1..64) is the type's schema's job, reported by device.parameters-invalid.
 */
export const benchCheckRules: readonly BenchCheckRule[] = [
  addressMixedSizesRule,
  addressDptMeaningRule,
  addressNoSenderRule,
  addressNoListenerRule,
  addressUnlinkedRule,
  addressSeveralReadRespondersRule,
  objectStatusUnlinkedRule,
  objectStatusOnCommandAddressRule,
  objectReadOnInitUnansweredRule,
  deviceDuplicateIndividualAddressRule,
  deviceUnknownTypeRule,
  indoorUnitTwoPrimariesRule,
  indoorUnitNoPrimaryRule,
  indoorUnitNoControllerRule,
  indoorUnitSeveralOutdoorUnitsRule,
  controllerNoUnitRule,
  controllerSeveralUnitsRule,
  gatewayExternalTemperatureOnSecondaryRule,
  gatewayMultiSplitWithoutOutdoorUnitRule,
  gatewaySingleSplitOnOutdoorUnitRule,
  outdoorUnitLeaderNotMemberRule,
  panelPresetOutOfRangeRule,
  lineExpectedLoadRule,
  topologyFilterBlocksRule,
  topologyFilterUnusedRule,
  topologyAddressWrongLineRule,
  topologyLineLimitsRule,
  // Last: it only reports what the specific rules above did not already explain.
  deviceParametersInvalidRule,
];

export interface CheckBenchOptions extends Partial<CheckOptions> {
  /** Run only these rule ids (all when absent). */
  readonly rules?: readonly string[];
}

/**
 * Checks a bench document before it runs and returns every finding, errors
 * first. Works on the validated document (addresses as text), so it reports
 * problems the loader would stop at, all at once.
 */
export function checkBench(bench: Bench, options: CheckBenchOptions = {}): CheckFinding[] {
  const view = benchView(bench);
  const bounds: CheckOptions = {
    loadWarnPercent: options.loadWarnPercent ?? defaultCheckOptions.loadWarnPercent,
    loadErrorPercent: options.loadErrorPercent ?? defaultCheckOptions.loadErrorPercent,
  };
  const rules = options.rules
    ? benchCheckRules.filter((rule) => options.rules!.includes(rule.id))
    : benchCheckRules;
  const findings: CheckFinding[] = [];
  const explained = new Set<string>();
  for (const rule of rules) {
    for (const finding of rule.check(view, bounds)) {
      const key = `${finding.location.device}#${finding.location.parameter}`;
      if (
        rule.id === deviceParametersInvalidRule.id &&
        finding.location.parameter !== undefined &&
        explained.has(key)
      )
        continue;
      if (finding.location.parameter !== undefined) explained.add(key);
      findings.push(finding);
    }
  }
  return findings.sort(compareFindings);
}
