import { readFileSync } from "node:fs";
import { dirname, resolve } from "node:path";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { loadBench } from "@/engine";
import { summarizeBench } from "@/engine";
import { SimHost } from "@/engine";
import { parseSimMessage } from "./sim-protocol";
import { createSimStore } from "./sim-store";

const fernhill: unknown = JSON.parse(
  readFileSync(
    resolve(
      dirname(fileURLToPath(import.meta.url)),
      "../../scenarios/benches/fernhill-training-centre.bench.json",
    ),
    "utf8",
  ),
);

describe("control-panel tiles in the bench summary", () => {
  it("lists the demo bench's panel tiles from the parsed parameters, with their sending address and button", () => {
    const loaded = loadBench(fernhill);
    if (!loaded.ok) throw new Error(loaded.error.map((e) => e.message).join("; "));
    const tiles = summarizeBench(loaded.value).controlPanelTiles;
    expect(tiles[0]).toEqual({
      deviceId: "cp-lab",
      deviceName: "Trainer control panel",
      object: 0,
      label: "Front power",
      kind: "toggle",
      dpt: "1.001",
      buttonId: "tile-1",
      groupAddress: "2/0/1",
      value: undefined,
    });
    // DPT spec 20.105: 3 = cool.
    expect(tiles.find((t) => t.label === "Front cool")).toMatchObject({
      kind: "value",
      groupAddress: "2/0/3",
      value: 3,
    });
    // A status tile has no button; its (first) address is the one it listens on.
    expect(tiles.find((t) => t.label === "Front room")).toMatchObject({
      kind: "status",
      buttonId: null,
      groupAddress: "2/1/5",
    });
  });

  it("a tile press reaches the gateway, and the tile follows the status it hears", () => {
    let wallMs = 0;
    const store = createSimStore();
    const host = new SimHost({
      post: (message) => store.getState().apply(parseSimMessage(structuredClone(message))),
      now: () => wallMs,
    });
    host.handle({ type: "load", bench: fernhill });
    host.handle({ type: "jump", durationUs: 2_000_000 });
    host.handle({ type: "press", deviceId: "cp-lab", buttonId: "tile-1" });
    host.handle({ type: "jump", durationUs: 2_000_000 });
    wallMs += 50;
    host.tick();
    const state = store.getState();
    const log = Array.from({ length: state.log.length }, (_, i) => state.log.at(i));
    // DPT spec §4 1.001: 1 = On, sent by the panel itself (1.1.40).
    expect(
      log.some((r) => r.source === "1.1.40" && r.destination === "2/0/1" && r.value === "On"),
    ).toBe(true);
    expect(state.devices["gw-front"]!.objects.find((o) => o.number === 1)!.value).toBe("On");
    expect(state.devices["cp-lab"]!.objects.find((o) => o.number === 0)!.value).toBe("On");
  });
});
