import { describe, expect, it } from "vitest";
import { loadBench, type Bench } from "@/engine";
import { checkBench } from "@/engine";
import {
  addDevice,
  addGroupAddress,
  connectObject,
  copyDevices,
  deleteGroupAddresses,
  deviceObjects,
  disconnectObject,
  joinUnitLink,
  moveNodes,
  pasteDevices,
  removeDevices,
  renameGroupAddress,
  renumberGroupAddress,
  sendingLinks,
  setGroupAddressDpt,
  setIndividualAddress,
  setDeviceRoom,
  setObjectFlags,
  setParameters,
  setSendingAddress,
  summarizeChanges,
  type EditResult,
} from "./index";
import { testBench } from "./test-bench";

function value<T>(result: EditResult<T>): T {
  if (!result.ok) throw new Error(`edit refused: ${result.error.message}`);
  return result.value;
}

function refusal<T>(result: EditResult<T>) {
  if (result.ok) throw new Error("expected the edit to be refused");
  return result.error;
}

/** Every bench the editor produces must still load in the engine. */
function expectLoads(bench: Bench) {
  const loaded = loadBench(bench);
  expect(loaded.ok ? [] : loaded.error).toEqual([]);
}

describe("addDevice", () => {
  it("gives a KNX device the lowest free individual address on the chosen line", () => {
    const bench = testBench();
    const first = value(addDevice(bench, { type: "switch-actuator", line: "main" }));
    // 1.1.1 and 1.1.2 are taken; knx-reference.md, Addresses: area.line.device.
    expect(first.bench.devices.at(-1)).toMatchObject({
      id: "switch-actuator-1",
      individualAddress: "1.1.3",
      line: "main",
    });
    const upper = value(addDevice(first.bench, { type: "push-button", line: "upper" }));
    expect(upper.bench.devices.at(-1)!.individualAddress).toBe("1.2.1");
    expectLoads(upper.bench);
  });

  it("skips the test tool's address and gives a unit-link device none", () => {
    let bench: Bench = { ...testBench(), testToolAddress: "1.1.3" };
    bench = value(addDevice(bench, { type: "switch-actuator" })).bench;
    expect(bench.devices.at(-1)!.individualAddress).toBe("1.1.4");
    const unit = value(addDevice(bench, { type: "indoor-unit" }));
    expect(unit.bench.devices.at(-1)!.individualAddress).toBeUndefined();
    expectLoads(unit.bench);
  });

  it("refuses an unknown type or line, naming the field", () => {
    expect(refusal(addDevice(testBench(), { type: "toaster" })).field).toBe("type");
    expect(refusal(addDevice(testBench(), { type: "push-button", line: "cellar" })).field).toBe(
      "line",
    );
  });
});

describe("links", () => {
  it("makes the first link of an object its sending address", () => {
    let bench = value(
      connectObject(testBench(), { device: "pb-hall", object: 0, groupAddress: "1/0/2" }),
    );
    const sending = sendingLinks(bench);
    const pbLinks = bench.links.filter((l) => l.device === "pb-hall");
    expect(pbLinks.map((l) => [l.groupAddress, sending.has(l)])).toEqual([
      ["1/0/1", true],
      ["1/0/2", false],
    ]);
    bench = value(
      setSendingAddress(bench, { device: "pb-hall", object: 0, groupAddress: "1/0/2" }),
    );
    expect(bench.links.filter((l) => l.device === "pb-hall").map((l) => l.groupAddress)).toEqual([
      "1/0/2",
      "1/0/1",
    ]);
    expectLoads(bench);
  });

  it("refuses an object on an address of another size and says both sizes", () => {
    // DPT spec §3: 1.001 is 1 bit, 5.001 one octet, 9.001 two octets.
    const error = refusal(
      connectObject(testBench(), { device: "act-hall", object: 0, groupAddress: "1/0/3" }),
    );
    expect(error.kind).toBe("edit.size-mismatch");
    expect(error.message).toMatch(/1\/0\/3.*5\.001 \(8 bit\).*1\.001 \(1 bit\)/);
    expect(
      refusal(connectObject(testBench(), { device: "act-hall", object: 1, groupAddress: "3/1/2" }))
        .message,
    ).toMatch(/16 bit/);
  });

  it("refuses a link that exists, an unknown object and an unknown address", () => {
    expect(
      refusal(connectObject(testBench(), { device: "pb-hall", object: 0, groupAddress: "1/0/1" }))
        .kind,
    ).toBe("edit.link-exists");
    // Another spelling of the same raw address is the same link.
    expect(
      refusal(connectObject(testBench(), { device: "pb-hall", object: 0, groupAddress: "1/1" }))
        .kind,
    ).toBe("edit.link-exists");
    expect(
      refusal(connectObject(testBench(), { device: "pb-hall", object: 9, groupAddress: "1/0/1" }))
        .kind,
    ).toBe("edit.object-unknown");
    expect(
      refusal(connectObject(testBench(), { device: "pb-hall", object: 0, groupAddress: "9/0/9" }))
        .kind,
    ).toBe("edit.address-unknown");
  });

  it("disconnects one link and leaves the others", () => {
    const bench = value(
      disconnectObject(testBench(), { device: "act-hall", object: 0, groupAddress: "1/0/1" }),
    );
    expect(bench.links).toHaveLength(2);
    expect(
      refusal(disconnectObject(bench, { device: "act-hall", object: 0, groupAddress: "1/0/1" }))
        .kind,
    ).toBe("edit.link-unknown");
  });
});

describe("group addresses", () => {
  it("allocates the next free address in a middle group and refuses a taken one", () => {
    const added = value(
      addGroupAddress(testBench(), { near: "1/0", name: "Hall scene", dpt: "17.001" }),
    );
    expect(added.address).toBe("1/0/4");
    expect(
      refusal(addGroupAddress(added.bench, { address: "1/0/4", name: "Again", dpt: "1.001" })).kind,
    ).toBe("edit.address-taken");
    // knx-reference.md, Addresses: 0/0/0 is broadcast, not a group.
    expect(
      refusal(addGroupAddress(added.bench, { address: "0/0/0", name: "Broadcast", dpt: "1.001" }))
        .field,
    ).toBe("address");
    expect(refusal(addGroupAddress(added.bench, { name: "Odd", dpt: "99.999" })).field).toBe("dpt");
    expectLoads(added.bench);
  });

  it("renumbers an address and every link follows it", () => {
    const bench = value(renumberGroupAddress(testBench(), "1/0/1", "2/0/7"));
    expect(bench.groupAddresses[0]!.address).toBe("2/0/7");
    expect(bench.links.filter((l) => l.groupAddress === "2/0/7")).toHaveLength(2);
    expect(bench.links.some((l) => l.groupAddress === "1/0/1")).toBe(false);
    expect(refusal(renumberGroupAddress(bench, "2/0/7", "1/0/2")).kind).toBe("edit.address-taken");
    expectLoads(bench);
  });

  it("renames, changes DPT only within the linked size, and deletes with links", () => {
    let bench = value(renameGroupAddress(testBench(), "1/0/1", "Hall ceiling"));
    expect(bench.groupAddresses[0]!.name).toBe("Hall ceiling");
    // DPT spec §3: 1.001 and 1.002 are both 1 bit; 5.001 is one octet.
    bench = value(setGroupAddressDpt(bench, "1/0/1", "1.002"));
    expect(refusal(setGroupAddressDpt(bench, "1/0/1", "5.001")).kind).toBe("edit.size-mismatch");
    bench = deleteGroupAddresses(bench, ["1/0/1"]);
    expect(bench.links.map((l) => l.groupAddress)).toEqual(["1/0/2"]);
    expectLoads(bench);
  });
});

describe("parameters", () => {
  it("adds and removes group objects with the parameters and drops links of vanished objects", () => {
    let bench = testBench();
    // Status objects off: object 1 "Status 1" vanishes, and its link to 1/0/2 with it.
    const off = value(
      setParameters(bench, "act-hall", { channels: 1, statusObjects: false, staircaseS: 0 }),
    );
    expect(off.droppedLinks).toBe(1);
    expect(deviceObjects(off.bench.devices[1]!).map((o) => o.number)).toEqual([0]);
    bench = value(
      setParameters(off.bench, "act-hall", { channels: 2, statusObjects: true, staircaseS: 0 }),
    ).bench;
    expect(deviceObjects(bench.devices[1]!).map((o) => o.number)).toEqual([0, 1, 2, 3]);
    expectLoads(bench);
  });

  it("drops a link whose object changes size with the parameters", () => {
    // A toggle rocker is 1.001 (1 bit); a value rocker is 5.001 (one octet), DPT spec §3.
    const outcome = value(
      setParameters(testBench(), "pb-hall", {
        channels: [{ function: "value", percent: 50, scene: 1 }],
      }),
    );
    expect(outcome.droppedLinks).toBe(1);
    expect(deviceObjects(outcome.bench.devices[0]!)[0]!.dpt).toBe("5.001");
    expectLoads(outcome.bench);
  });

  it("refuses parameters the type's schema refuses and names the field", () => {
    const error = refusal(setParameters(testBench(), "act-hall", { channels: 12 }));
    expect(error.field).toBe("parameters.channels");
  });

  it("stores only the flags that differ from the type's default", () => {
    let bench = value(setObjectFlags(testBench(), "act-hall", 1, { read: false }));
    expect(bench.devices[1]!.objectFlags).toEqual({ "1": { read: false } });
    expect(deviceObjects(bench.devices[1]!)[1]!.flags.read).toBe(false);
    bench = value(setObjectFlags(bench, "act-hall", 1, { read: true }));
    expect(bench.devices[1]!.objectFlags).toBeUndefined();
  });
});

describe("devices", () => {
  it("edits the individual address, moving the device to the matching line", () => {
    const bench = value(setIndividualAddress(testBench(), "pb-hall", "1.2.9"));
    expect(bench.devices[0]).toMatchObject({ individualAddress: "1.2.9", line: "upper" });
    expect(refusal(setIndividualAddress(bench, "pb-hall", "1.1.2")).kind).toBe(
      "edit.address-taken",
    );
    expect(refusal(setIndividualAddress(bench, "pb-hall", "1.1.250")).kind).toBe(
      "edit.address-taken",
    );
    expect(refusal(setIndividualAddress(bench, "pb-hall", "16.1.1")).field).toBe(
      "individualAddress",
    );
  });

  it("puts a device in one of the bench's rooms and out again, refusing a room the bench lacks", () => {
    const withRooms: Bench = { ...testBench(), rooms: [{ id: "hall", name: "Hall" }] };
    const inHall = value(setDeviceRoom(withRooms, "pb-hall", "hall"));
    expect(inHall.devices[0]!.room).toBe("hall");
    expect(loadBench(inHall).ok).toBe(true);
    expect("room" in value(setDeviceRoom(inHall, "pb-hall", undefined)).devices[0]!).toBe(false);
    expect(refusal(setDeviceRoom(withRooms, "pb-hall", "attic"))).toMatchObject({
      kind: "edit.room-unknown",
      field: "room",
    });
  });

  it("removes a device with its links and its unit link", () => {
    let bench = testBench();
    bench = value(addDevice(bench, { type: "hvac-gateway" })).bench;
    bench = value(addDevice(bench, { type: "indoor-unit" })).bench;
    bench = value(joinUnitLink(bench, "hvac-gateway-1", "indoor-unit-1"));
    expect(bench.unitLinks).toEqual([
      { id: "unit-link-1", members: ["hvac-gateway-1", "indoor-unit-1"] },
    ]);
    bench = value(addDevice(bench, { type: "wall-controller" })).bench;
    bench = value(joinUnitLink(bench, "wall-controller-1", "indoor-unit-1"));
    expect(bench.unitLinks[0]!.members).toEqual([
      "hvac-gateway-1",
      "indoor-unit-1",
      "wall-controller-1",
    ]);
    expect(refusal(joinUnitLink(bench, "pb-hall", "indoor-unit-1")).kind).toBe(
      "edit.unit-link-invalid",
    );
    expectLoads(bench);
    bench = removeDevices(bench, ["indoor-unit-1", "act-hall"]);
    expect(bench.unitLinks[0]!.members).toEqual(["hvac-gateway-1", "wall-controller-1"]);
    expect(bench.links.map((l) => l.device)).toEqual(["pb-hall"]);
    bench = removeDevices(bench, ["wall-controller-1"]);
    expect(bench.unitLinks).toEqual([]);
  });

  it("pastes copies with fresh ids, free addresses, their links and their own unit link", () => {
    let bench = testBench();
    bench = value(addDevice(bench, { type: "hvac-gateway", position: { x: 10, y: 20 } })).bench;
    bench = value(addDevice(bench, { type: "indoor-unit" })).bench;
    bench = value(joinUnitLink(bench, "hvac-gateway-1", "indoor-unit-1"));
    const clipboard = copyDevices(bench, ["pb-hall", "hvac-gateway-1", "indoor-unit-1"]);
    const pasted = pasteDevices(bench, clipboard);
    expect(pasted.deviceIds).toEqual(["push-button-1", "hvac-gateway-2", "indoor-unit-2"]);
    const copies = pasted.bench.devices.slice(-3);
    expect(copies.map((d) => d.individualAddress)).toEqual(["1.1.4", "1.1.5", undefined]);
    expect(copies[1]!.position).toEqual({ x: 50, y: 60 });
    expect(pasted.bench.links.at(-1)).toEqual({
      device: "push-button-1",
      object: 0,
      groupAddress: "1/0/1",
    });
    expect(pasted.bench.unitLinks.at(-1)).toEqual({
      id: "unit-link-2",
      members: ["hvac-gateway-2", "indoor-unit-2"],
    });
    expectLoads(pasted.bench);
  });

  it("stores positions of cards and bus-bars in whole canvas units", () => {
    const bench = moveNodes(testBench(), [
      { node: { kind: "device", id: "pb-hall" }, position: { x: 10.4, y: 20.6 } },
      { node: { kind: "group-address", address: "1/1" }, position: { x: 300, y: 40 } },
    ]);
    expect(bench.devices[0]!.position).toEqual({ x: 10, y: 21 });
    expect(bench.groupAddresses[0]!.position).toEqual({ x: 300, y: 40 });
  });
});

describe("summarizeChanges", () => {
  it("says what changed for the revision history", () => {
    const before = testBench();
    let after = value(addDevice(before, { type: "push-button" })).bench;
    after = value(
      connectObject(after, { device: "push-button-1", object: 0, groupAddress: "1/0/2" }),
    );
    after = value(renameGroupAddress(after, "1/0/3", "Hall dimmer"));
    after = moveNodes(after, [
      { node: { kind: "device", id: "pb-hall" }, position: { x: 1, y: 1 } },
    ]);
    expect(summarizeChanges(before, after)).toBe(
      "Added 1 device, edited 1 group address, linked 1 object, moved 1 node",
    );
    expect(summarizeChanges(before, before)).toBe("No changes");
  });

  it("feeds the bench checks: an unlinked status object is reported after its link goes", () => {
    const bench = value(
      disconnectObject(testBench(), { device: "act-hall", object: 1, groupAddress: "1/0/2" }),
    );
    expect(
      checkBench(bench).some((f) => f.location.device === "act-hall" && f.location.object === 1),
    ).toBe(true);
  });
});
