// @vitest-environment jsdom
// jsdom supplies DOMParser, so the report is read back by a real XML parser.
import { describe, expect, it } from "vitest";
import { escapeXml, junitXml } from "./junit-xml";
import {
  outcomeIsOk,
  scenarioOutcome,
  stepTotals,
  suiteResult,
  type ScenarioResult,
  type StepResult,
} from "./scenario-result";

const step = (
  index: number,
  status: StepResult["status"],
  extra: Partial<StepResult> = {},
): StepResult => ({
  index,
  kind: "expect-value",
  label: `expect-value 1/1/1 = true`,
  status,
  startUs: index * 1000,
  endUs: index * 1000 + 500,
  trace: [],
  ...extra,
});

const scenario = (name: string, steps: StepResult[], expectedToFail = false): ScenarioResult => {
  const outcome = scenarioOutcome(steps, expectedToFail);
  return {
    name,
    source: `scenarios/${name}.scenario.json`,
    seed: 1,
    expectedToFail,
    outcome,
    ok: outcomeIsOk(outcome),
    steps,
    totals: stepTotals(steps),
    virtualTimeUs: 2000,
    wallMs: 3,
  };
};

function parse(xml: string): Document {
  // The XML must be well formed: a parser error document has a <parsererror> root.
  const document = new DOMParser().parseFromString(xml, "application/xml");
  expect(document.getElementsByTagName("parsererror")).toHaveLength(0);
  return document;
}

describe("junitXml", () => {
  const results = [
    scenario("passes", [step(0, "pass"), step(1, "pass")]),
    scenario("fails <&>", [
      step(0, "pass"),
      step(1, "fail", {
        expected: "true",
        actual: 'false "off"',
        trace: [
          {
            kind: "user.action",
            timeUs: 1000,
            action: "group.write",
            groupAddress: 0x0901,
            detail: "write true",
            input: { kind: "write", groupAddress: "1/1/1", value: true },
          },
        ],
      }),
    ]),
    scenario("errors", [step(0, "error", { message: "unknown device pb-9" }), step(1, "skipped")]),
    scenario("fault-finding", [step(0, "fail", { expected: "1", actual: "0" })], true),
    scenario("unexpectedly fine", [step(0, "pass")], true),
  ];
  const suite = suiteResult("Lab suite", results, 15);
  const document = parse(junitXml([suite]));

  it("counts tests, failures and errors the way CI reads them", () => {
    const root = document.documentElement;
    expect(root.tagName).toBe("testsuites");
    expect(root.getAttribute("tests")).toBe("5");
    expect(root.getAttribute("failures")).toBe("2");
    expect(root.getAttribute("errors")).toBe("1");
    const testsuite = document.getElementsByTagName("testsuite")[0]!;
    expect(testsuite.getAttribute("name")).toBe("Lab suite");
    expect(testsuite.getAttribute("time")).toBe("0.015");
  });

  it("writes one testcase per scenario with its verdict", () => {
    const cases = [...document.getElementsByTagName("testcase")];
    expect(cases.map((c) => c.getAttribute("name"))).toEqual([
      "passes",
      "fails <&>",
      "errors",
      "fault-finding",
      "unexpectedly fine",
    ]);
    const verdict = (index: number) => {
      const children = [...cases[index]!.children].map((child) => child.tagName);
      return children.filter((tag) => tag !== "system-out");
    };
    expect(verdict(0)).toEqual([]);
    expect(verdict(1)).toEqual(["failure"]);
    expect(verdict(2)).toEqual(["error"]);
    expect(verdict(3)).toEqual([]);
    expect(verdict(4)).toEqual(["failure"]);
    const failure = cases[1]!.getElementsByTagName("failure")[0]!;
    expect(failure.getAttribute("message")).toBe(
      '#1 expect-value 1/1/1 = true @0:00:00.001: fail; expected true, got false "off"',
    );
    expect(failure.textContent).toContain("0:00:00.001 user group.write 1/1/1: write true");
    expect(cases[2]!.getElementsByTagName("error")[0]!.getAttribute("message")).toContain(
      "unknown device pb-9",
    );
    expect(cases[0]!.getAttribute("classname")).toBe("scenarios/passes.scenario.json");
  });

  it("escapes markup and drops characters XML cannot carry", () => {
    expect(escapeXml(`a<b>&"c'\u0001`)).toBe("a&lt;b&gt;&amp;&quot;c&apos;");
  });
});

describe("suiteResult", () => {
  it("counts an expected failure as ok and an unexpected pass as a failure", () => {
    const suite = suiteResult(
      "s",
      [
        scenario("a", [step(0, "pass")]),
        scenario("b", [step(0, "fail")], true),
        scenario("c", [step(0, "pass")], true),
      ],
      0,
    );
    expect(suite.totals).toEqual({
      scenarios: 3,
      ok: 2,
      failed: 1,
      errors: 0,
      expectedFailures: 1,
      unexpectedPasses: 1,
    });
    expect(suite.ok).toBe(false);
  });
});
