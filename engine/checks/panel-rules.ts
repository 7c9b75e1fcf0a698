import { describeAddress, describeObject } from "./describe-member";
import type { BenchCheckRule } from "./bench-check-rule";
import type { CheckFinding } from "./check-finding";

interface Tile {
  readonly kind?: unknown;
  readonly value?: unknown;
}

/** What a receiving HVAC controller accepts, from its own parameters. */
function refusal(
  dpt: string,
  value: number,
  parameters: Record<string, unknown>,
): string | undefined {
  const { setpointMinC: min, setpointMaxC: max, fanLevels, fanAuto, fanAutoObject } = parameters;
  if (dpt === "9.001" && typeof min === "number" && typeof max === "number") {
    if (value < min || value > max)
      return `${value} °C is outside its setpoint limits ${min}..${max} °C, so it will clamp and report ${value < min ? min : max} °C`;
  }
  // 5.100 fan stage and 5.010 level counter carry the level number (hvac-gateway/fan-speed.ts).
  if ((dpt === "5.100" || dpt === "5.010") && typeof fanLevels === "number") {
    if (value > fanLevels)
      return `fan level ${value} is above its ${fanLevels} levels, so it will run at level ${fanLevels}`;
    if (value === 0 && fanAutoObject === true)
      return "fan level 0 is refused: it takes the automatic fan on its separate automatic-fan object";
    if (value === 0 && fanAuto === false)
      return "fan level 0 asks for the automatic fan, which it does not offer";
  }
  return undefined;
}

/**
 * A control-panel preset the receiving gateway or wall controller cannot take:
 * a setpoint outside its limits or a fan level it does not have. The device
 * clamps, so the button "works" but never gives what its label promises.
 * Setpoint clamping and fixed fan levels: common practice, no published source.
 */
export const panelPresetOutOfRangeRule: BenchCheckRule = {
  id: "panel.preset-out-of-range",
  severity: "warning",
  title: "A control-panel preset is outside what the receiving controller accepts",
  check(view) {
    const findings: CheckFinding[] = [];
    for (const [id, entry] of view.devices) {
      if (entry.device.type !== "control-panel") continue;
      const tiles = (entry.parameters.tiles ?? []) as readonly Tile[];
      tiles.forEach((tile, index) => {
        if (tile.kind !== "value" || typeof tile.value !== "number") return;
        const first = view.linksOf(id, index)[0];
        const address = first === undefined ? undefined : view.addresses.get(first);
        if (address === undefined) return;
        for (const member of address.members) {
          const receiver = view.devices.get(member.device);
          if (
            receiver === undefined ||
            member.spec?.role !== "command" ||
            !member.spec.flags.write ||
            (receiver.device.type !== "hvac-gateway" && receiver.device.type !== "wall-controller")
          )
            continue;
          const why = refusal(member.spec.dpt, tile.value, receiver.parameters);
          if (why === undefined) continue;
          findings.push({
            rule: this.id,
            severity: this.severity,
            message: `${describeObject(view, id, index)} sends ${tile.value} on ${describeAddress(address.text, address.name)}, but for ${describeObject(view, member.device, member.object)} ${why}`,
            location: { device: id, object: index, parameter: `tiles.${index}.value` },
          });
        }
      });
    }
    return findings;
  },
};
