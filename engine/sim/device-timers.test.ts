import { describe, expect, it } from "vitest";
import { DeviceTimers } from "./device-timers";

describe("DeviceTimers", () => {
  it("keeps the latest generation per timer name until it is deleted or cleared", () => {
    const timers = new DeviceTimers();
    timers.set("model.step", 1);
    timers.set("link.supervise", 2);
    timers.set("model.step", 3); // set again: the first generation no longer fires
    expect(timers.get("model.step")).toBe(3);
    expect(timers.get("link.supervise")).toBe(2);
    timers.delete("model.step");
    expect(timers.get("model.step")).toBeUndefined();
    expect(timers.get("link.supervise")).toBe(2);
    timers.delete("never-set");
    timers.clear();
    expect(timers.get("link.supervise")).toBeUndefined();
  });

  it("gives a fork a copy that changes independently of the original", () => {
    const original = new DeviceTimers();
    original.set("a", 1);
    original.set("b", 2);
    const copy = original.copy();
    copy.set("a", 5);
    copy.delete("b");
    original.set("c", 7);
    expect([original.get("a"), original.get("b"), original.get("c")]).toEqual([1, 2, 7]);
    expect([copy.get("a"), copy.get("b"), copy.get("c")]).toEqual([5, undefined, undefined]);
  });

  it("finds a live timer's name and data by its generation, and nothing once it is replaced or deleted", () => {
    const timers = new DeviceTimers();
    timers.set("window.delay", 1, { contact: 4 });
    timers.set("model.step", 2);
    const live = timers.indexOfGeneration(1);
    expect([timers.nameAt(live), timers.dataAt(live)]).toEqual(["window.delay", { contact: 4 }]);
    timers.set("window.delay", 3, { contact: 5 }); // replaced: generation 1 no longer fires
    expect(timers.indexOfGeneration(1)).toBe(-1);
    timers.delete("window.delay"); // the last entry moves into its place, with its data
    const moved = timers.indexOfGeneration(2);
    expect([timers.nameAt(moved), timers.dataAt(moved)]).toEqual(["model.step", undefined]);
    expect(timers.indexOfGeneration(3)).toBe(-1);
  });
});
