import { describe, expect, it } from "vitest";
import { formatIndividualAddress } from "../address";
import { loadBench } from "../bench";
import { benchBuilder } from "../../test/harness/bench-builder";
import { tunnelAddressPool } from "./tunnel-address-pool";

function loaded(extra: (b: ReturnType<typeof benchBuilder>) => void = () => undefined) {
  const b = benchBuilder();
  b.groupAddress("1/0/1", "1.001");
  b.device("act", "switch-actuator", "1.1.241");
  extra(b);
  const result = loadBench(b.build());
  if (!result.ok) throw new Error(result.error.map((e) => e.message).join("; "));
  return result.value;
}

describe("tunnelAddressPool", () => {
  it("hands out free addresses on the line, skipping devices and the test tool", () => {
    const bench = loaded();
    const pool = tunnelAddressPool(bench, bench.lines[0]!.id, 3);
    if (!pool.ok) throw new Error(pool.error.message);
    // The builder's test tool sits at 1.1.250 unless told otherwise (test/harness/bench-builder.ts).
    const text = [pool.value.individualAddress, ...pool.value.tunnelAddresses].map(
      formatIndividualAddress,
    );
    expect(text).toEqual(["1.1.240", "1.1.242", "1.1.243", "1.1.244"]);
    expect(text).not.toContain(formatIndividualAddress(bench.testToolAddress));
  });

  it("refuses an unknown line and a request for more tunnels than the line has room for", () => {
    const bench = loaded();
    expect(tunnelAddressPool(bench, "nowhere", 1)).toMatchObject({
      ok: false,
      error: { field: "lineId" },
    });
    expect(tunnelAddressPool(bench, bench.lines[0]!.id, 300)).toMatchObject({
      ok: false,
      error: { field: "tunnels" },
    });
    expect(tunnelAddressPool(bench, bench.lines[0]!.id, 0)).toMatchObject({
      ok: false,
      error: { field: "tunnels" },
    });
  });
});
