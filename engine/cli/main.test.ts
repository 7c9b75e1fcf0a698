// @vitest-environment jsdom
// jsdom supplies DOMParser, so the JUnit report is read back by a real XML parser.
import { spawnSync } from "node:child_process";
import { mkdtempSync, readdirSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { dirname, join, resolve } from "node:path";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { main } from "./main";

const root = resolve(dirname(fileURLToPath(import.meta.url)), "../..");
const suite = join(root, "scenarios/demo.suite.json");
// Counted from the suite file, so adding a shipped scenario does not mean editing this test.
const listed = (JSON.parse(readFileSync(suite, "utf8")) as { scenarios: string[] }).scenarios;
const total = listed.length;
const exercises = listed.filter((path) => path.includes("exercise-")).length;

function run(argv: string[]) {
  let stdout = "";
  let stderr = "";
  let clockMs = 0;
  const code = main(argv, {
    stdout: (t) => (stdout += t),
    stderr: (t) => (stderr += t),
    cwd: root,
    now: () => (clockMs += 1),
  });
  return { code, stdout, stderr };
}

function junit(path: string) {
  const document = new DOMParser().parseFromString(readFileSync(path, "utf8"), "application/xml");
  expect(document.getElementsByTagName("parsererror")).toHaveLength(0);
  return document;
}

const tmp = () => mkdtempSync(join(tmpdir(), "benchline-cli-"));

function scenarioFile(folder: string, doc: object): string {
  const path = join(folder, "case.scenario.json");
  writeFileSync(
    path,
    JSON.stringify({
      format: 1,
      bench: { path: join(root, "scenarios/benches/fernhill-training-centre.bench.json") },
      ...doc,
    }),
  );
  return path;
}

describe("scenarios CLI", () => {
  it("runs the demo suite, exits 0 and writes JUnit that reads back", () => {
    const out = join(tmp(), "reports/junit.xml");
    const { code, stdout } = run([suite, "--junit", out]);
    expect(code).toBe(0);
    expect(stdout).toMatch(new RegExp(`^Running ${total} of ${total} scenario\\(s\\)`));
    expect(stdout).toContain("XFAIL Exercise: the door rocker should switch the bench lights");
    expect(stdout).toContain(
      `${total - exercises} passed, ${exercises} failed as expected, 0 failed, 0 passed unexpectedly, 0 errors`,
    );
    const document = junit(out);
    const root = document.documentElement;
    expect([
      root.getAttribute("tests"),
      root.getAttribute("failures"),
      root.getAttribute("errors"),
    ]).toEqual([String(total), "0", "0"]);
    expect(document.getElementsByTagName("testsuite")[0]!.getAttribute("name")).toBe(
      "Benchline demo scenarios",
    );
    expect(document.getElementsByTagName("failure")).toHaveLength(0);
  });

  it("filters by name or path, and splits into shards that cover the suite once", () => {
    expect(run([suite, "--filter", "QUAYSIDE"]).stdout).toMatch(
      new RegExp(`^Running 3 of ${total} scenario\\(s\\) matching "QUAYSIDE"`),
    );
    const shards = [1, 2, 3].map((i) => run([suite, "--shard", `${i}/3`, "--quiet"]));
    expect(shards.map((s) => s.code)).toEqual([0, 0, 0]);
    const counts = shards.map((s) =>
      Number(new RegExp(`^Running (\\d+) of ${total}`).exec(s.stdout)?.[1]),
    );
    // Shards differ by at most one and add up to the suite.
    expect(counts.reduce((a, b) => a + b, 0)).toBe(total);
    expect(Math.max(...counts) - Math.min(...counts)).toBeLessThanOrEqual(1);
  });

  it("exits 1 on a failing expectation and names it in the JUnit failure", () => {
    const folder = tmp();
    const file = scenarioFile(folder, {
      name: "Status never comes",
      steps: [
        { kind: "write", groupAddress: "2/0/2", value: 22 },
        { kind: "expect-value", groupAddress: "2/1/2", value: 25, within: "1s" },
      ],
    });
    const out = join(folder, "junit.xml");
    const { code, stdout } = run([file, "--junit", out, "--seed", "3"]);
    expect(code).toBe(1);
    expect(stdout).toContain("FAIL  Status never comes");
    expect(stdout).toContain("seed 3");
    const failure = junit(out).getElementsByTagName("failure")[0]!;
    expect(failure.getAttribute("message")).toMatch(
      /^#1 expect-value 2\/1\/2 = 25 within 1s @.*: fail; expected .*25\.00 °C.*, got 2\/1\/2 carried 22\.00 °C/,
    );
  });

  it("exits 1 when a scenario marked expectedToFail passes", () => {
    const file = scenarioFile(tmp(), {
      name: "Wrongly marked",
      expectedToFail: true,
      steps: [{ kind: "wait", for: "1s" }],
    });
    const { code, stdout } = run([file]);
    expect(code).toBe(1);
    expect(stdout).toContain("XPASS Wrongly marked");
  });

  it("reports an invalid scenario as an error pointing at the step and field", () => {
    const file = scenarioFile(tmp(), { name: "Broken", steps: [{ kind: "wait", for: "soon" }] });
    const { code, stdout } = run([file]);
    expect(code).toBe(1);
    expect(stdout).toContain('steps[0].for: expected a duration like "500ms"');
  });

  it("exits 2 on bad arguments with the usage text", () => {
    const { code, stderr } = run([suite, "--shard", "4/3"]);
    expect(code).toBe(2);
    expect(stderr).toContain("--shard: expected i/n");
    expect(stderr).toContain("Usage: npm run scenarios");
  });

  it("prints every virtual time of a failure in one format, h:mm:ss.mmm, or to the µs with --us", () => {
    const file = scenarioFile(tmp(), {
      name: "Late status",
      steps: [
        { kind: "wait", for: "1h" },
        { kind: "write", groupAddress: "2/0/2", value: 22 },
        { kind: "expect-value", groupAddress: "2/1/2", value: 25, within: "1s" },
      ],
    });
    const { stdout } = run([file]);
    const block = stdout.slice(
      stdout.indexOf("FAIL  Late status"),
      stdout.indexOf("\n\n1 scenario"),
    );
    const traceTimes = [...block.matchAll(/^\s+\| (\S+) /gm)].map((m) => m[1]!);
    expect(traceTimes.length).toBeGreaterThan(0);
    for (const time of traceTimes) expect(time).toMatch(/^1:00:0\d\.\d{3}$/);
    expect(block).toMatch(/#2 expect-value .* at 1:00:0\d\.\d{3}: fail/);
    expect(block).toMatch(/\(write at 1:00:0\d\.\d{3}\)/);
    // No bare unit-suffixed times such as "10801s", "10801020104us" or "10802035ms".
    expect(block).not.toMatch(/\b\d{5,}(?:us|ms|s)\b/);

    const micro = run([file, "--us"]).stdout;
    const microTimes = [...micro.matchAll(/^\s+\| (\S+) /gm)].map((m) => m[1]!);
    expect(microTimes.length).toBe(traceTimes.length);
    for (const time of microTimes) expect(time).toMatch(/^1:00:0\d\.\d{6}$/);
  });

  it("runs every scenario and suite file in a folder, but not its bench files", () => {
    const { code, stdout } = run(["scenarios/quayside"]);
    expect(code).toBe(0);
    expect(stdout).toMatch(/^Running 3 of 3 scenario\(s\)/);
    // scenarios/ itself holds the suite file; its benches/ folder is not searched.
    const suiteSize = (
      JSON.parse(readFileSync(suite, "utf8")) as {
        scenarios: unknown[];
      }
    ).scenarios.length;
    expect(run(["scenarios"]).stdout).toMatch(
      new RegExp(`^Running ${suiteSize} of ${suiteSize} scenario\\(s\\)`),
    );
  });

  it("expands patterns itself, since a shell may pass them on unexpanded", () => {
    const { code, stdout } = run(["scenarios/fernhill/*.scenario.json"]);
    expect(code).toBe(0);
    const fernhill = readdirSync(join(root, "scenarios/fernhill")).filter((name) =>
      name.endsWith(".scenario.json"),
    ).length;
    expect(stdout).toMatch(new RegExp(`^Running ${fernhill} of ${fernhill} scenario\\(s\\)`));
    expect(run(["scenarios/**/room-*.json"]).stdout).toMatch(/^Running 3 of 3 scenario\(s\)/);
    expect(run(["scenarios/{fernhill,quayside}/lights-toggle.scenario.json"]).stdout).toMatch(
      /^Running 1 of 1 scenario\(s\)/,
    );
    // The same file named twice (a pattern and the file itself) runs once.
    expect(
      run(["scenarios/quayside/*.json", "scenarios/quayside/bus-load.scenario.json"]).stdout,
    ).toMatch(/^Running 3 of 3 scenario\(s\)/);
  });

  it("exits 2 naming a pattern that matches nothing or a folder without scenarios", () => {
    const nothing = run(["scenarios/fernhill/*.nothing.json"]);
    expect(nothing.code).toBe(2);
    expect(nothing.stderr).toContain(
      "scenarios/fernhill/*.nothing.json: no scenario or suite file matches",
    );
    const empty = run(["scenarios/benches"]);
    expect(empty.code).toBe(2);
    expect(empty.stderr).toContain(
      "scenarios/benches: no scenario or suite files (*.json) in the folder",
    );
  });

  it("works as a process: the npm script's entry sets the exit code", () => {
    const folder = tmp();
    const file = scenarioFile(folder, {
      name: "Fails",
      steps: [{ kind: "expect-value", groupAddress: "2/1/2", value: 25, within: "100ms" }],
    });
    const result = spawnSync(
      process.execPath,
      ["--import", "tsx", join(root, "engine/cli/main.ts"), file],
      { cwd: root, encoding: "utf8" },
    );
    expect(result.stdout).toContain("FAIL  Fails");
    expect(result.status).toBe(1);
  });
});
