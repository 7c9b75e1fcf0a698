import type { BenchCheckRule } from "./bench-check-rule";
import type { CheckFinding } from "./check-finding";
import { childPath, walkParameterObjects } from "./walk-parameters";

// DPT spec §3 (17.001 / 18.001): scenes 1..64 travel as 0..63; people number them 1..64.
const SCENE_MIN = 1;
const SCENE_MAX = 64;
const SCENE_KEYS: readonly string[] = ["scene", "sceneNumber"];

/**
 * A scene number outside 1..64 cannot be sent or recalled with DPT 17.001 or
 * 18.001. Reads the parameters as written, because a device type's own schema
 * may refuse the value before any rule sees it.
 */
export const sceneNumberOutOfRangeRule: BenchCheckRule = {
  id: "scene.number-out-of-range",
  severity: "error",
  title: "A scene number is outside 1..64",
  check(view) {
    const findings: CheckFinding[] = [];
    for (const [id, entry] of view.devices) {
      walkParameterObjects(entry.device.parameters, (object, path) => {
        for (const key of SCENE_KEYS) {
          const scene = object[key];
          if (scene === undefined) continue;
          if (
            typeof scene === "number" &&
            Number.isInteger(scene) &&
            scene >= SCENE_MIN &&
            scene <= SCENE_MAX
          )
            continue;
          findings.push({
            rule: this.id,
            severity: this.severity,
            message: `${entry.device.name} (${id}): scene ${JSON.stringify(scene)} at ${childPath(path, key)} is outside ${SCENE_MIN}..${SCENE_MAX} (DPT 17.001 carries scenes 1..64)`,
            location: { device: id, parameter: childPath(path, key) },
          });
        }
      });
    }
    return findings;
  },
};
