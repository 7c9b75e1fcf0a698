import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { DEFAULT_BUDGET_MS, inShard, parseCliArgs } from "./cli-args";

describe("parseCliArgs", () => {
  it("reads files and every option in both spellings", () => {
    const result = parseCliArgs([
      "a.json",
      "--seed",
      "7",
      "--filter=fan",
      "--shard",
      "2/3",
      "--junit=out.xml",
      "b.suite.json",
      "--quiet",
      "--us",
    ]);
    expect(result).toEqual({
      ok: true,
      value: {
        files: ["a.json", "b.suite.json"],
        seed: 7,
        filter: "fan",
        shard: { index: 2, count: 3 },
        junit: "out.xml",
        budgetMs: DEFAULT_BUDGET_MS,
        quiet: true,
        timePrecision: "us",
        help: false,
      },
    });
  });

  it.each([
    [["a.json", "--seed", "x"], '--seed: expected a non-negative integer, got "x"'],
    [["a.json", "--seed"], "--seed: needs a value"],
    [["a.json", "--shard", "0/3"], '--shard: expected i/n with 1 <= i <= n, like "2/4", got "0/3"'],
    [["a.json", "--shard", "4/3"], '--shard: expected i/n with 1 <= i <= n, like "2/4", got "4/3"'],
    [["a.json", "--shard=1-3"], '--shard: expected i/n with 1 <= i <= n, like "2/4", got "1-3"'],
    [["a.json", "--budget", "0"], '--budget: expected a positive number of milliseconds, got "0"'],
    [["a.json", "--verbose"], "--verbose: unknown option (see --help)"],
    [["a.json", "--quiet=yes"], "--quiet: takes no value"],
    [["a.json", "--us=1"], "--us: takes no value"],
    [[], "files: give at least one scenario or suite file"],
  ])("refuses %j naming the argument", (argv, message) => {
    const result = parseCliArgs(argv);
    expect(result).toEqual({
      ok: false,
      error: { kind: "cli.invalid-argument", argument: message.split(":")[0], message },
    });
  });

  it("treats everything after -- as files", () => {
    const result = parseCliArgs(["--", "--odd-name.json"]);
    expect(result.ok && result.value.files).toEqual(["--odd-name.json"]);
  });
});

describe("inShard", () => {
  it("puts every scenario in exactly one shard", () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 16 }), fc.nat(1000), (count, position) => {
        const shards = Array.from({ length: count }, (_, i) =>
          inShard(position, { index: i + 1, count }),
        );
        expect(shards.filter(Boolean)).toHaveLength(1);
      }),
    );
  });
});
