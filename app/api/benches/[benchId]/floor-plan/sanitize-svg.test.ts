import { describe, expect, it } from "vitest";
import { sanitizeSvg } from "./sanitize-svg";

describe("sanitizeSvg", () => {
  it("strips scripts, event handlers, foreign content and external references, keeping the drawing", () => {
    const input = `<?xml version="1.0"?>
<!DOCTYPE svg [<!ENTITY boom "x">]>
<svg xmlns="http://www.w3.org/2000/svg" xmlns:xlink="http://www.w3.org/1999/xlink" width="400" height="200" onload="alert(1)">
  <script>alert(1)</script><script href="https://elsewhere.test/x.js"/>
  <foreignObject><iframe src="https://elsewhere.test"></iframe></foreignObject>
  <style>@import url(https://elsewhere.test/a.css); rect { fill: url(#grad) }</style>
  <rect x="0" y="0" width="400" height="200" ONCLICK='steal()' style="background:url('https://elsewhere.test/t.png')"/>
  <image href="https://elsewhere.test/plan.png" width="10" height="10"/>
  <use xlink:href="#room-1"/>
  <a href="javascript:alert(1)"><text>Lab room</text></a>
</svg>`;
    const result = sanitizeSvg(input)!;
    expect(result.svg).not.toMatch(
      /<script|alert\(|onload|onclick|foreignObject|iframe|elsewhere\.test|@import|javascript:|<!DOCTYPE|<!ENTITY/i,
    );
    expect(result.svg).toContain('<use xlink:href="#room-1"/>');
    expect(result.svg).toContain("url(#grad)");
    expect(result.svg).toContain("<text>Lab room</text>");
    expect(result.removed).toEqual(
      expect.arrayContaining(["script", "event handler", "external reference", "document type"]),
    );
  });

  it("keeps embedded PNG data and refuses a file without an svg element", () => {
    const png = "data:image/png;base64,iVBORw0KGgo=";
    expect(sanitizeSvg(`<svg><image href="${png}"/></svg>`)!.svg).toContain(png);
    expect(sanitizeSvg("<html><body>not a drawing</body></html>")).toBeNull();
  });
});
