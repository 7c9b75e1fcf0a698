import { describe, expect, it } from "vitest";
import { parseGroupAddress, parseIndividualAddress } from "../address";
import { groupPasses, individualPasses, mainGroupOf, nextHopCount } from "./coupler-rules";
import { couplerLines, isWithin, linePath, lineKind, upperLineAddress } from "./line-address";

const ga = (text: string) => {
  const raw = parseGroupAddress(text);
  if (!raw.ok) throw new Error(text);
  return raw.value;
};
const ia = (text: string) => {
  const raw = parseIndividualAddress(text);
  if (!raw.ok) throw new Error(text);
  return raw.value;
};
const line = (text: string) => ia(`${text}.0`) >> 8;

describe("coupler settings for group telegrams", () => {
  const table = new Set([ga("1/2/3")]);

  // knx-reference.md, Topology (Basic course): couplers pass group telegrams by filter table.
  it("filter: passes what the table holds and filters the rest", () => {
    expect(groupPasses("filter", table, ga("1/2/3"))).toBe("pass");
    expect(groupPasses("filter", table, ga("1/2/4"))).toBe("filter");
  });

  // knx-reference.md, Topology: "or pass/block all by setting".
  it("forward passes every group telegram, table or not", () => {
    expect(groupPasses("forward", new Set(), ga("1/2/4"))).toBe("pass");
    expect(groupPasses("forward", new Set(), ga("31/7/255"))).toBe("pass");
  });

  it("block passes none, even a table entry or main group 15", () => {
    expect(groupPasses("block", table, ga("1/2/3"))).toBe("blocked");
    expect(groupPasses("block", table, ga("15/0/1"))).toBe("blocked");
  });

  // From memory (Basic course): main groups 14 and 15 pass a filtering coupler without a table entry.
  it("filter passes main groups 14 and 15 without a table entry, and no other main group", () => {
    expect(groupPasses("filter", new Set(), ga("14/0/1"))).toBe("pass");
    expect(groupPasses("filter", new Set(), ga("15/7/255"))).toBe("pass");
    expect(groupPasses("filter", new Set(), ga("13/7/255"))).toBe("filter");
    expect(groupPasses("filter", new Set(), ga("16/0/0"))).toBe("filter");
  });

  // knx-reference.md, Addresses: raw = main << 11 | middle << 8 | sub.
  it("reads the main group from the top 5 bits", () => {
    expect(mainGroupOf(ga("14/3/7"))).toBe(14);
    expect(mainGroupOf(ga("31/7/255"))).toBe(31);
  });
});

describe("coupler settings for individually addressed telegrams", () => {
  // Routing by address: a telegram crosses when its destination lies on the other side
  // (knx-reference.md, Topology: line coupler a.l.0 joins a.l to a.0, area coupler a.0.0 joins a.0 to 0.0).
  it("route: a line coupler passes up what is not for its line, and down what is", () => {
    const lower = line("1.2");
    expect(individualPasses("route", lower, "up", ia("1.3.5"))).toBe("pass");
    expect(individualPasses("route", lower, "up", ia("1.2.5"))).toBe("filter");
    expect(individualPasses("route", lower, "down", ia("1.2.5"))).toBe("pass");
    expect(individualPasses("route", lower, "down", ia("2.2.5"))).toBe("filter");
  });

  it("route: an area coupler passes down what is for any line of its area", () => {
    const lower = line("1.0");
    expect(individualPasses("route", lower, "down", ia("1.4.9"))).toBe("pass");
    expect(individualPasses("route", lower, "down", ia("1.0.9"))).toBe("pass");
    expect(individualPasses("route", lower, "down", ia("2.4.9"))).toBe("filter");
    expect(individualPasses("route", lower, "up", ia("2.4.9"))).toBe("pass");
    expect(individualPasses("route", lower, "up", ia("1.4.9"))).toBe("filter");
  });

  it("forward passes all and block none", () => {
    expect(individualPasses("forward", line("1.2"), "up", ia("1.2.5"))).toBe("pass");
    expect(individualPasses("block", line("1.2"), "up", ia("1.3.5"))).toBe("blocked");
  });
});

describe("routing counter", () => {
  // knx-reference.md, Topology: decremented by one per coupler; 0 is not forwarded;
  // 7 is forwarded without decrement (from memory, as the reference marks it).
  it("decreases by one and stops at 0", () => {
    expect(nextHopCount(6)).toBe(5);
    expect(nextHopCount(1)).toBe(0);
    expect(nextHopCount(0)).toBeUndefined();
  });

  it("7 is never decremented", () => {
    expect(nextHopCount(7)).toBe(7);
  });
});

describe("line addresses", () => {
  // knx-reference.md, Topology: line 0 of an area is its main line, area 0 the backbone.
  it("names kinds and upper lines", () => {
    expect(lineKind(line("0.0"))).toBe("backbone");
    expect(lineKind(line("3.0"))).toBe("main");
    expect(lineKind(line("3.4"))).toBe("line");
    expect(upperLineAddress(line("3.4"))).toBe(line("3.0"));
    expect(upperLineAddress(line("3.0"))).toBe(line("0.0"));
    expect(upperLineAddress(line("0.0"))).toBeUndefined();
  });

  // knx-reference.md, Topology: line coupler a.l.0, area coupler a.0.0.
  it("a coupler's address says which two lines it joins", () => {
    expect(couplerLines(ia("1.2.0"))).toEqual({
      lower: line("1.2"),
      upper: line("1.0"),
      kind: "line",
    });
    expect(couplerLines(ia("1.0.0"))).toEqual({
      lower: line("1.0"),
      upper: line("0.0"),
      kind: "area",
    });
    expect(couplerLines(ia("1.2.3"))).toBeUndefined();
    expect(couplerLines(ia("0.0.0"))).toBeUndefined();
  });

  it("a path goes up to the common line, then down", () => {
    expect(linePath(line("1.1"), line("1.1"))).toEqual([]);
    expect(linePath(line("1.1"), line("1.2"))).toEqual([
      { lower: line("1.1"), direction: "up" },
      { lower: line("1.2"), direction: "down" },
    ]);
    expect(linePath(line("1.1"), line("2.3"))).toEqual([
      { lower: line("1.1"), direction: "up" },
      { lower: line("1.0"), direction: "up" },
      { lower: line("2.0"), direction: "down" },
      { lower: line("2.3"), direction: "down" },
    ]);
    expect(linePath(line("0.0"), line("2.0"))).toEqual([{ lower: line("2.0"), direction: "down" }]);
    expect(isWithin(line("2.3"), line("2.0"))).toBe(true);
    expect(isWithin(line("2.3"), line("1.0"))).toBe(false);
  });
});
