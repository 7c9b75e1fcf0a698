import { describe, expect, it } from "vitest";
import { err, ok } from "./result";

describe("Result", () => {
  it("tells success from failure by the ok field", () => {
    expect(ok(3)).toEqual({ ok: true, value: 3 });
    expect(err("bad")).toEqual({ ok: false, error: "bad" });
  });
});
