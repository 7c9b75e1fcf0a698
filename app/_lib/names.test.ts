import { describe, expect, it } from "vitest";
import { nameSchema, unsafeCharacterIn } from "./names";

describe("unsafeCharacterIn", () => {
  it("accepts ordinary names in any script, emoji (surrogate pairs) included", () => {
    for (const name of [
      "Hall wiring",
      "Büro 2.OG",
      "Ωmega bench",
      "قاعة التدريب",
      "Plant 🔌 room",
      "東棟",
    ]) {
      expect(unsafeCharacterIn(name)).toBeNull();
    }
  });

  it("names NUL and other control characters", () => {
    expect(unsafeCharacterIn("a\u0000b")).toBe("the control character U+0000");
    expect(unsafeCharacterIn("a\nb")).toBe("the control character U+000A");
    expect(unsafeCharacterIn("a\u0085b")).toBe("the control character U+0085");
  });

  // Unicode Bidirectional Algorithm (UAX #9) explicit formatting characters.
  it.each([
    0x202a, 0x202b, 0x202c, 0x202d, 0x202e, 0x2066, 0x2067, 0x2068, 0x2069, 0x200e, 0x200f, 0x061c,
  ])("names the bidirectional control U+%s", (code) => {
    expect(unsafeCharacterIn(`a${String.fromCharCode(code)}b`)).toMatch(
      /bidirectional control U\+/,
    );
  });

  it("names lone surrogates, high or low, at any position", () => {
    expect(unsafeCharacterIn("a\ud800")).toBe("an unpaired surrogate U+D800");
    expect(unsafeCharacterIn("\udc00a")).toBe("an unpaired surrogate U+DC00");
    expect(unsafeCharacterIn("\ud83d\ud83d\udd0c")).toBe("an unpaired surrogate U+D83D");
  });
});

describe("nameSchema", () => {
  const schema = nameSchema("a bench name", "give the bench a name");
  it("trims, bounds and refuses unsafe characters with a message naming them", () => {
    expect(schema.parse("  Hall  ")).toBe("Hall");
    expect(schema.safeParse("   ").error?.issues[0]?.message).toBe("give the bench a name");
    expect(schema.safeParse("x".repeat(121)).error?.issues[0]?.message).toMatch(/at most 120/);
    expect(schema.safeParse("Hall\u202Etxt").error?.issues[0]?.message).toBe(
      "a bench name may not contain the bidirectional control U+202E",
    );
  });
});
