import { formatIndividualAddress } from "../address";
import { couplerLines, formatLineAddress } from "../topology/line-address";
import type { BenchError } from "./bench-error";

/**
 * The loader's check of a coupler: its individual address must be a.l.0 or
 * a.0.0 (knx-reference.md, Topology), and both lines it joins must be on the
 * bench. Returns the coupler's own (lower) line id, or the errors, each naming
 * the field at fault.
 */
export function checkCouplerLines(
  path: string,
  deviceId: string,
  individualAddress: number,
  lines: readonly { readonly id: string; readonly lineAddress: number }[],
  declaredLine: string | undefined,
): { readonly line?: string; readonly errors: readonly BenchError[] } {
  const text = formatIndividualAddress(individualAddress);
  const joined = couplerLines(individualAddress);
  if (joined === undefined)
    return {
      errors: [
        {
          kind: "bench.coupler-address",
          path: `${path}.individualAddress`,
          message: `coupler "${deviceId}": individual address ${text} is not a coupler's address; a line coupler is a.l.0 (joins line a.l to main line a.0), an area coupler a.0.0 (joins main line a.0 to the backbone 0.0)`,
          deviceId,
        },
      ],
    };
  const errors: BenchError[] = [];
  const lower = lines.find((l) => l.lineAddress === joined.lower);
  const upper = lines.find((l) => l.lineAddress === joined.upper);
  for (const [which, address, found] of [
    ["its own line", joined.lower, lower],
    ["the line above", joined.upper, upper],
  ] as const) {
    if (found === undefined)
      errors.push({
        kind: "bench.coupler-line-missing",
        path: `${path}.individualAddress`,
        message: `coupler "${deviceId}" (${text}) joins line ${formatLineAddress(joined.lower)} to ${formatLineAddress(joined.upper)}, but ${which}, ${formatLineAddress(address)}, is not in lines`,
        deviceId,
      });
  }
  if (lower !== undefined && declaredLine !== undefined && declaredLine !== lower.id)
    errors.push({
      kind: "bench.coupler-line-missing",
      path: `${path}.line`,
      message: `coupler "${deviceId}" (${text}) sits on line ${formatLineAddress(joined.lower)} ("${lower.id}"), not on "${declaredLine}"`,
      deviceId,
    });
  return { line: lower?.id, errors };
}
