import { describe, expect, it } from "vitest";
import type { BenchInput } from "./bench-schema";
import { migrateBench } from "./bench-migrations";
import { loadBench } from "./load-bench";
import { hallFixture } from "@/test/harness/fixture-benches";

function bench(overrides: Partial<BenchInput> = {}): BenchInput {
  return {
    ...hallFixture()
      .named("Lab bench")
      .link("pb-hall", 0, "1/0/1", "1/0/2")
      .link("act-hall", 0, "1/0/1")
      .link("act-hall", 1, "1/0/2")
      .build(),
    ...overrides,
  };
}

function errorsOf(input: unknown) {
  const result = loadBench(input);
  if (result.ok) throw new Error("expected the bench to be refused");
  return result.error;
}

describe("loadBench", () => {
  it("resolves addresses to raw numbers and keeps the first link as the sending address", () => {
    const result = loadBench(bench());
    if (!result.ok) throw new Error(JSON.stringify(result.error));
    const loaded = result.value;
    // knx-reference.md, Addresses: raw = main<<11 | middle<<8 | sub; area<<12 | line<<8 | device.
    expect(loaded.testToolAddress).toBe(0x11fa);
    const pb = loaded.deviceById.get("pb-hall")!;
    expect(pb.individualAddress).toBe(0x1101);
    expect(pb.line).toBe("main");
    expect(pb.objects[0]!.groupAddresses).toEqual([0x0801, 0x0802]);
    expect(loaded.groupAddresses.get(0x0803)?.sizeBits).toBe(8);
  });

  it("loads rooms with engine/room's defaults for what they leave out, and the devices placed in them", () => {
    const base = bench();
    const result = loadBench({
      ...base,
      rooms: [{ id: "hall", name: "Hall", initialC: 18, envelopeUaWPerK: 80 }],
      devices: base.devices!.map((d) => ({ ...d, room: "hall" })),
    });
    if (!result.ok) throw new Error(JSON.stringify(result.error));
    expect(result.value.rooms).toEqual([
      {
        id: "hall",
        name: "Hall",
        spec: { initialC: 18, outdoorC: 10, heatCapacityJPerK: 600_000, envelopeUaWPerK: 80 },
      },
    ]);
    expect(result.value.deviceById.get("pb-hall")!.room).toBe("hall");
  });

  it("a bench without rooms loads as before, with none", () => {
    const result = loadBench(bench());
    expect(result.ok && result.value.rooms).toEqual([]);
  });

  it("names a device's unknown room and a room id used twice", () => {
    const base = bench();
    const errors = errorsOf({
      ...base,
      rooms: [
        { id: "hall", name: "Hall" },
        { id: "hall", name: "Hall again" },
      ],
      devices: base.devices!.map((d, i) => (i === 0 ? { ...d, room: "attic" } : d)),
    });
    expect(errors.map((e) => [e.kind, e.path])).toEqual([
      ["bench.duplicate-id", "rooms[1].id"],
      ["bench.room-unknown", "devices[0].room"],
    ]);
  });

  it("names an id used twice in lines, unit links and devices, each where its second use is", () => {
    const base = bench();
    const errors = errorsOf({
      ...base,
      lines: [...base.lines!, { ...base.lines![0]!, address: "1.2" }],
      unitLinks: [
        { id: "ul", members: ["pb-hall", "act-hall"] },
        { id: "ul", members: ["pb-hall", "act-hall"] },
      ],
      devices: [...base.devices!, { ...base.devices![0]!, individualAddress: "1.1.9" }],
    });
    const id = base.devices![0]!.id;
    expect(errors.filter((e) => e.kind === "bench.duplicate-id")).toEqual([
      {
        kind: "bench.duplicate-id",
        path: "lines[1].id",
        message: `line id "${base.lines![0]!.id}" is used twice`,
      },
      {
        kind: "bench.duplicate-id",
        path: "unitLinks[1].id",
        message: 'unit link id "ul" is used twice',
      },
      {
        kind: "bench.duplicate-id",
        path: "devices[2].id",
        message: `device id "${id}" is used twice`,
        deviceId: id,
      },
    ]);
  });

  it("names an unknown device type", () => {
    const errors = errorsOf(
      bench({
        devices: [{ id: "x-1", type: "toaster", name: "X", individualAddress: "1.1.9" }],
        links: [],
      }),
    );
    expect(errors).toEqual([
      expect.objectContaining({
        kind: "bench.device-type-unknown",
        path: "devices[0].type",
        deviceId: "x-1",
      }),
    ]);
  });

  it("names a duplicate individual address, including the test tool's", () => {
    const base = bench();
    const errors = errorsOf({
      ...base,
      devices: [
        ...base.devices!,
        { id: "pb-two", type: "push-button", name: "Second", individualAddress: "1.1.1" },
        { id: "pb-three", type: "push-button", name: "Third", individualAddress: "1.1.250" },
      ],
    });
    expect(errors.map((e) => [e.kind, e.path, e.deviceId])).toEqual([
      ["bench.duplicate-individual-address", "devices[2].individualAddress", "pb-two"],
      ["bench.duplicate-individual-address", "devices[3].individualAddress", "pb-three"],
    ]);
    expect(errors[1]!.message).toMatch(/testToolAddress/);
  });

  it("names an address linked to objects of different sizes", () => {
    const base = bench();
    // A 1-bit switch object on an 8-bit 5.001 address (DPT spec: 1.001 is 1 bit, 5.001 one octet).
    const errors = errorsOf({
      ...base,
      links: [...base.links!, { device: "act-hall", object: 0, groupAddress: "1/0/3" }],
    });
    expect(errors).toEqual([
      expect.objectContaining({
        kind: "bench.address-size-mismatch",
        deviceId: "act-hall",
        object: 0,
        groupAddress: "1/0/3",
      }),
    ]);
    expect(errors[0]!.message).toMatch(/1\/0\/3.*5\.001.*1\.001/);
  });

  it("points at the parameter that does not fit the type", () => {
    const errors = errorsOf(
      bench({
        devices: [
          {
            id: "act-1",
            type: "switch-actuator",
            name: "A",
            individualAddress: "1.1.5",
            parameters: { channels: 12 },
          },
        ],
        links: [],
      }),
    );
    expect(errors[0]).toMatchObject({
      kind: "bench.parameters-invalid",
      path: "devices[0].parameters.channels",
      deviceId: "act-1",
    });
  });

  it("points at links to unknown devices, objects and addresses", () => {
    const errors = errorsOf(
      bench({
        links: [
          { device: "ghost", object: 0, groupAddress: "1/0/1" },
          { device: "act-hall", object: 7, groupAddress: "1/0/1" },
          { device: "act-hall", object: 0, groupAddress: "3/3/3" },
        ],
      }),
    );
    expect(errors.map((e) => [e.kind, e.path])).toEqual([
      ["bench.link-device-unknown", "links[0].device"],
      ["bench.link-address-unknown", "links[2].groupAddress"],
      ["bench.object-unknown", "links[1].object"],
    ]);
  });

  it("refuses a bad address text and names the field", () => {
    const errors = errorsOf(
      bench({ groupAddresses: [{ address: "0/0/0", name: "Broadcast", dpt: "1.001" }], links: [] }),
    );
    // knx-reference.md, Addresses: 0/0/0 is broadcast, not a group.
    expect(errors[0]).toMatchObject({
      kind: "bench.address-invalid",
      path: "groupAddresses[0].address",
    });
  });

  it("refuses a unit-link member that is not on the bench", () => {
    const errors = errorsOf(
      bench({ unitLinks: [{ id: "wiring", members: ["pb-hall", "nobody"] }] }),
    );
    expect(errors[0]).toMatchObject({
      kind: "bench.unit-link-member-unknown",
      path: "unitLinks[0].members[1]",
    });
  });

  it("reports schema problems with a JSON path", () => {
    const errors = errorsOf({ ...bench(), lines: [] });
    expect(errors[0]).toMatchObject({ kind: "bench.schema", path: "lines" });
    expect(
      errorsOf({ ...bench(), devices: [{ id: "Bad Id", type: "push-button", name: "x" }] })[0],
    ).toMatchObject({ path: "devices[0].id" });
  });

  it("refuses a document without a format, or from a newer version", () => {
    expect(errorsOf({ name: "x" })[0]!.kind).toBe("bench.format-missing");
    expect(errorsOf({ ...bench(), format: 99 })[0]!.kind).toBe("bench.format-unsupported");
    expect(errorsOf([])[0]!.kind).toBe("bench.not-an-object");
  });
});

describe("migrateBench", () => {
  it("walks every step from an older format to the current one", () => {
    const migrations = {
      1: (doc: Record<string, unknown>) => ({ ...doc, format: 2, renamed: doc.old }),
      2: (doc: Record<string, unknown>) => ({ ...doc, format: 3 }),
    };
    const result = migrateBench({ format: 1, old: "x" }, migrations, 3);
    expect(result).toEqual({ ok: true, value: { format: 3, old: "x", renamed: "x" } });
  });

  it("says so when a step is missing", () => {
    const result = migrateBench({ format: 1 }, {}, 2);
    expect(result.ok ? undefined : result.error.kind).toBe("bench.format-unsupported");
  });
});
