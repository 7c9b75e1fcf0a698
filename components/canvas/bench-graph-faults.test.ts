import { describe, expect, it } from "vitest";
import { testBench } from "@/components/bench-editor/model/test-bench";
import { benchGraph, type DeviceNode } from "./bench-graph";

describe("benchGraph fault overlay", () => {
  it("hands each device its active faults and leaves healthy devices without any", () => {
    const { nodes } = benchGraph(testBench(), {
      faults: new Map([
        ["act-hall", ["bus.silent", "link.two-primaries"]],
        ["pb-hall", []],
      ]),
    });
    const devices = nodes.filter((n): n is DeviceNode => n.type === "device");
    expect(Object.fromEntries(devices.map((n) => [n.id, n.data.faults]))).toEqual({
      "d:pb-hall": undefined,
      "d:act-hall": ["bus.silent", "link.two-primaries"],
    });
  });
});
