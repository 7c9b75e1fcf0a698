import { JSDOM } from "jsdom";
import { beforeAll, describe, expect, it } from "vitest";
import { sanitizeSvg } from "./sanitize-svg";

const SVG_NS = "http://www.w3.org/2000/svg";
const window = new JSDOM("").window;

// The sanitizer loads jsdom on first use; that second or two belongs to no single case.
beforeAll(() => sanitizeSvg(""), 60_000);

/** The stored text, or "" when the file was refused. */
function outputOf(result: unknown): string {
  if (result && typeof result === "object" && "svg" in result) return String(result.svg);
  return "";
}

function refused(result: unknown): boolean {
  return result === null || (typeof result === "object" && result !== null && "refused" in result);
}

/**
 * Read the output as the browser will (XML, image/svg+xml) and check there is
 * nothing that can run or fetch: no script, foreign content or animation
 * element under any prefix, no on* attribute, no link or url() except to "#id".
 */
function expectInert(svg: string) {
  if (svg === "") return;
  const doc = new window.DOMParser().parseFromString(svg, "image/svg+xml");
  expect(doc.documentElement.localName).toBe("svg");
  for (const element of Array.from(doc.getElementsByTagNameNS("*", "*"))) {
    expect(element.namespaceURI).toBe(SVG_NS);
    expect([
      "script",
      "foreignObject",
      "set",
      "animate",
      "animateTransform",
      "animateMotion",
      "style",
    ]).not.toContain(element.localName);
    for (const attribute of Array.from(element.attributes)) {
      expect(attribute.localName.toLowerCase()).not.toMatch(/^on/);
      if (attribute.localName === "href" || attribute.localName === "src")
        expect(attribute.value.trim()).toMatch(/^#/);
      expect(attribute.value.toLowerCase()).not.toMatch(/javascript:|data:|url\(\s*['"]?[^#'"\s]/);
    }
  }
}

describe("sanitizeSvg: the bypasses of the old strip-list", () => {
  it("removes a script element written with a namespace prefix (svg:script under xmlns:svg)", async () => {
    const input = `<svg xmlns="${SVG_NS}" xmlns:svg="${SVG_NS}" width="40" height="20"><svg:script>window.ran = true</svg:script><rect width="40" height="20"/></svg>`;
    const result = await sanitizeSvg(input);
    const out = outputOf(result);
    expect(out).not.toContain("window.ran");
    expectInert(out);
    expect(out).toContain("<rect");
  });

  it("refuses or cleans an event handler written after a slash (<rect/onload=...>)", async () => {
    for (const input of [
      `<svg xmlns="${SVG_NS}"><rect/onload="window.ran=true"/></svg>`,
      `<svg xmlns="${SVG_NS}"><rect/onload='window.ran=true' width="4"></rect></svg>`,
    ]) {
      const out = outputOf(await sanitizeSvg(input));
      expect(out).not.toMatch(/onload/i);
      expectInert(out);
    }
  });

  it("removes javascript: URLs hidden behind character references", async () => {
    const input = `<svg xmlns="${SVG_NS}" xmlns:xlink="http://www.w3.org/1999/xlink"><a xlink:href="&#106;avascript:window.ran=true"><text>Lab</text></a><a href="&#x6A;&#x61;vascript&#x3A;1"><text>Hall</text></a><a href="jav&#x09;ascript:1"><text>Store</text></a><a xmlns:x="http://www.w3.org/1999/xlink" x:href="&#106;avascript:1"><text>Plant</text></a><a><animate attributeName="href" values="&#106;avascript:window.ran=true"/><text>Roof</text></a></svg>`;
    const out = outputOf(await sanitizeSvg(input));
    expectInert(out);
    expect(out).toContain("Lab");
    expect(out).not.toMatch(/href|avascript/);
  });

  it("removes a reference to another host written with any xlink prefix, keeping #fragments", async () => {
    const input = `<svg xmlns="${SVG_NS}" xmlns:l="http://www.w3.org/1999/xlink"><image l:href="http://127.0.0.1:9/leak.png" width="4" height="4"/><use l:href="https://elsewhere.test/x.svg#a"/><use l:href="#room"/><rect id="room" width="4" height="4" fill="url(#hatch)" stroke="url(http://127.0.0.1:9/p#x)"/></svg>`;
    const result = await sanitizeSvg(input);
    const out = outputOf(result);
    expectInert(out);
    expect(out).not.toMatch(/127\.0\.0\.1|elsewhere/);
    expect(out).toMatch(/href="#room"/);
    expect(out).toContain('fill="url(#hatch)"');
    expect((result as unknown as { removed: string[] }).removed).toContain("external reference");
  });

  it("removes animation that could set an event handler or a link (<set attributeName=onload>)", async () => {
    const input = `<svg xmlns="${SVG_NS}"><rect width="4" height="4"><set attributeName="onload" to="window.ran=true"/><animate attributeName="href" values="javascript:1"/></rect><a><set attributeName="href" to="https://elsewhere.test"/><text>x</text></a></svg>`;
    const out = outputOf(await sanitizeSvg(input));
    expectInert(out);
    expect(out).not.toMatch(/attributeName|window\.ran|elsewhere/);
  });
});

describe("sanitizeSvg: what else a floor plan may not carry", () => {
  it("drops scripts, handlers, foreign content, styles that fetch and external references, keeping the drawing", async () => {
    const input = `<?xml version="1.0"?>
<svg xmlns="${SVG_NS}" xmlns:xlink="http://www.w3.org/1999/xlink" width="400" height="200" onload="alert(1)">
  <script>alert(1)</script><script href="https://elsewhere.test/x.js"/>
  <foreignObject><iframe xmlns="http://www.w3.org/1999/xhtml" src="https://elsewhere.test"></iframe></foreignObject>
  <style>@import url(https://elsewhere.test/a.css); rect { fill: url(#grad) }</style>
  <defs><linearGradient id="grad"><stop offset="0" stop-color="#fff"/></linearGradient></defs>
  <rect x="0" y="0" width="400" height="200" ONCLICK='steal()' style="background:url('https://elsewhere.test/t.png')"/>
  <rect style="fill:u\\72l(https://elsewhere.test/t.png)"/>
  <image href="data:image/svg+xml;base64,PHN2Zz48L3N2Zz4=" width="10" height="10"/>
  <use xlink:href="#grad"/>
  <text x="10" y="20">Lab room</text>
</svg>`;
    const result = await sanitizeSvg(input);
    const out = outputOf(result);
    expectInert(out);
    expect(out).not.toMatch(/alert|steal|elsewhere|@import|data:/);
    expect(out).toContain("Lab room");
    expect(out).toContain('id="grad"');
    expect((result as unknown as { removed: string[] }).removed).toEqual(
      expect.arrayContaining(["script", "event handler", "external reference"]),
    );
  });

  it("refuses a file that is not SVG, not well-formed or declares entities, with a reason", async () => {
    for (const input of [
      "<html><body>not a drawing</body></html>",
      "<svg><rect/></svg>", // no SVG namespace: the browser would not draw it either
      `<svg xmlns="${SVG_NS}"><rect></svg>`,
      `<!DOCTYPE svg [<!ENTITY big "${"x".repeat(100)}">]><svg xmlns="${SVG_NS}"><text>&big;&big;</text></svg>`,
      "",
    ]) {
      const result = await sanitizeSvg(input);
      expect(refused(result)).toBe(true);
      expect((result as { refused: string }).refused.length).toBeGreaterThan(0);
    }
  });

  it("keeps a plain drawing as it is, with the document type dropped", async () => {
    const input = `<!DOCTYPE svg PUBLIC "-//W3C//DTD SVG 1.1//EN" "http://www.w3.org/Graphics/SVG/1.1/DTD/svg11.dtd"><svg xmlns="${SVG_NS}" viewBox="0 0 10 10"><g id="walls"><path d="M0 0H10V10H0Z" fill="none" stroke="#333"/></g></svg>`;
    const out = outputOf(await sanitizeSvg(input));
    expect(out).toBe(
      `<svg xmlns="${SVG_NS}" viewBox="0 0 10 10"><g id="walls"><path d="M0 0H10V10H0Z" fill="none" stroke="#333"/></g></svg>`,
    );
  });
});

// Defect 2: the old strip-list took quadratic time on these (9 s for 160 KB of
// spaces). Only the answer is checked here; `npm run bench:svg` measures time.
describe("sanitizeSvg: adversarial 2 MiB inputs finish with the right answer", () => {
  const size = 2 * 1024 * 1024;
  const fill = (unit: string) => unit.repeat(Math.floor(size / unit.length));

  it("spaces: inside a drawing they are kept as text, alone they are refused", async () => {
    const inside = `<svg xmlns="${SVG_NS}"><text>${fill(" ")}</text></svg>`;
    expect(outputOf(await sanitizeSvg(inside)).length).toBeGreaterThan(size - 100);
    expect(refused(await sanitizeSvg(fill(" ")))).toBe(true);
    expect(refused(await sanitizeSvg(`<svg xmlns="${SVG_NS}" ${fill(" ")}`))).toBe(true);
  });

  it("repeated url( in an attribute and in text: the attribute goes, the text stays inert", async () => {
    const attribute = `<svg xmlns="${SVG_NS}"><rect fill="${fill("url(")}" width="1"/></svg>`;
    const out = outputOf(await sanitizeSvg(attribute));
    expect(out).toBe(`<svg xmlns="${SVG_NS}"><rect width="1"/></svg>`);
    const text = `<svg xmlns="${SVG_NS}"><style>${fill("url(")}</style><text>${fill("url( ")}</text></svg>`;
    expectInert(outputOf(await sanitizeSvg(text)));
  });

  it("repeated <!DOCTYPE is refused", async () => {
    expect(refused(await sanitizeSvg(fill("<!DOCTYPE ")))).toBe(true);
    expect(
      refused(await sanitizeSvg(`<!DOCTYPE svg>${fill("<!DOCTYPE svg>")}<svg xmlns="${SVG_NS}"/>`)),
    ).toBe(true);
  });
});
