import { createServer, type Server } from "node:http";
import type { AddressInfo } from "node:net";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { launchChromium } from "./chromium";
import { demoPassword, signIn } from "./support/sign-in";

/**
 * A stored SVG floor plan must never run as the person viewing it. An
 * apprentice uploads each payload that passed the old strip-list into their
 * own sandbox bench; an admin then opens the image directly in a tab (where a
 * document's own scripts would run) and the bench editor (where it is drawn).
 * Every payload would mark `window.__ran` and call a listener on 127.0.0.1:
 * neither may happen, and no request may leave for any other origin.
 */

const ADMIN = "ines.admin@fernhill.example";
const APPRENTICE = "leo.apprentice@fernhill.example";
const SVG_NS = "http://www.w3.org/2000/svg";
const XLINK_NS = "http://www.w3.org/1999/xlink";

let listener: Server;
let listenerOrigin = "";
const listenerHits: string[] = [];

/** The script each payload tries to run: a flag in the page and a call to the listener. */
function probe(name: string): string {
  return `window.__ran=(window.__ran||[]).concat('${name}');fetch('${listenerOrigin}/hit/${name}');new Image().src='${listenerOrigin}/img/${name}'`;
}

/** The bypasses named in the security report, each a whole SVG file. */
function payloads(): { name: string; svg: string }[] {
  const big = 'width="400" height="400"';
  return [
    {
      name: "prefixed-script",
      svg: `<svg xmlns="${SVG_NS}" xmlns:svg="${SVG_NS}" ${big}><svg:script>${probe("prefixed-script")}</svg:script><rect ${big} fill="#ddd"/></svg>`,
    },
    {
      name: "slash-handler",
      svg: `<svg xmlns="${SVG_NS}" ${big}><rect/onload="${probe("slash-handler")}" ${big}/></svg>`,
    },
    {
      name: "entity-javascript",
      // "&#106;" is "j": the old strip-list looked for the literal word.
      svg: `<svg xmlns="${SVG_NS}" xmlns:x="${XLINK_NS}" ${big}><a x:href="&#106;avascript:${probe("entity-javascript")}"><rect ${big} fill="#ccc"/></a></svg>`,
    },
    {
      name: "namespaced-href",
      svg: `<svg xmlns="${SVG_NS}" xmlns:x="${XLINK_NS}" ${big}><image x:href="${listenerOrigin}/img/namespaced-href" ${big}/><use x:href="${listenerOrigin}/use.svg#a"/></svg>`,
    },
    {
      name: "set-handler",
      svg: `<svg xmlns="${SVG_NS}" ${big}><rect ${big} fill="#bbb"><set attributeName="onclick" to="${probe("set-handler")}"/><set attributeName="onmouseover" to="${probe("set-handler")}"/></rect></svg>`,
    },
  ];
}

async function signInByApi(baseURL: string, email: string): Promise<string> {
  const response = await fetch(`${baseURL}/api/session`, {
    method: "POST",
    headers: { "content-type": "application/json", origin: baseURL },
    body: JSON.stringify({ email, password: demoPassword(email) }),
  });
  expect(response.status).toBe(200);
  return response.headers.get("set-cookie")!.split(";")[0]!;
}

async function ranIn(page: Page): Promise<unknown> {
  return page.evaluate(() => (window as unknown as { __ran?: string[] }).__ran ?? null);
}

describe("stored SVG floor plans in headless Chromium", () => {
  const baseURL = inject("baseURL");
  let browser: Browser;
  let admin: Page;
  let benchId = "";
  let apprenticeCookie = "";
  const foreignRequests: string[] = [];

  beforeAll(async () => {
    listener = createServer((request, response) => {
      listenerHits.push(request.url ?? "");
      response.writeHead(204).end();
    });
    await new Promise<void>((resolve) => listener.listen(0, "127.0.0.1", resolve));
    listenerOrigin = `http://127.0.0.1:${(listener.address() as AddressInfo).port}`;

    // The apprentice's own sandbox bench, made from a shared bench's document.
    apprenticeCookie = await signInByApi(baseURL, APPRENTICE);
    const list = (await (
      await fetch(`${baseURL}/api/benches`, { headers: { cookie: apprenticeCookie } })
    ).json()) as { benches: { id: string }[] };
    const source = (await (
      await fetch(`${baseURL}/api/benches/${list.benches[0]!.id}`, {
        headers: { cookie: apprenticeCookie },
      })
    ).json()) as { revision: { document: unknown } };
    const created = await fetch(`${baseURL}/api/benches`, {
      method: "POST",
      headers: { "content-type": "application/json", origin: baseURL, cookie: apprenticeCookie },
      body: JSON.stringify({ name: "Sandbox with a drawing", document: source.revision.document }),
    });
    expect(created.status).toBe(201);
    benchId = ((await created.json()) as { bench: { id: string } }).bench.id;

    browser = await launchChromium();
    admin = await browser.newPage({ viewport: { width: 1280, height: 900 } });
    admin.on("request", (request) => {
      const url = request.url();
      if (!url.startsWith(baseURL) && !url.startsWith("data:") && !url.startsWith("blob:"))
        foreignRequests.push(url);
    });
    await signIn(admin, ADMIN, demoPassword(ADMIN), "/benches");
  });

  afterAll(async () => {
    await browser?.close();
    await new Promise<void>((resolve) => (listener ? listener.close(() => resolve()) : resolve()));
  });

  it("serves pages, the API and floor plans each with their own policy, as the browser receives them", async () => {
    const page = await admin.goto(`${baseURL}/benches`);
    expect(page!.headers()["content-security-policy"]).toContain("script-src 'self'");
    const api = await admin.goto(`${baseURL}/api/session`);
    expect(api!.headers()["content-security-policy"]).toBe("default-src 'none'; sandbox");
    const unknownApi = await admin.goto(`${baseURL}/api/no-such-thing`);
    expect(unknownApi!.headers()["content-security-policy"]).toBe("default-src 'none'; sandbox");
  });

  for (const { name } of [
    { name: "prefixed-script" },
    { name: "slash-handler" },
    { name: "entity-javascript" },
    { name: "namespaced-href" },
    { name: "set-handler" },
  ]) {
    it(`${name}: stored and served to an admin, nothing runs and nothing leaves`, async () => {
      const payload = payloads().find((p) => p.name === name)!;
      const put = await fetch(`${baseURL}/api/benches/${benchId}/floor-plan`, {
        method: "PUT",
        headers: { "content-type": "image/svg+xml", origin: baseURL, cookie: apprenticeCookie },
        body: payload.svg,
      });
      // Refusing the file is as good as cleaning it; either way it must not run.
      expect([201, 400]).toContain(put.status);
      if (put.status === 400) {
        const error = ((await put.json()) as { error: { field: string } }).error;
        expect(error.field).toBe("file");
        return;
      }
      const { floorPlan } = (await put.json()) as { floorPlan: { url: string } };

      // Opened directly in a tab, where a document's own scripts would run.
      const served = await admin.goto(`${baseURL}${floorPlan.url}`);
      await admin.mouse.move(50, 50);
      await admin.mouse.click(50, 50);
      await admin.waitForLoadState("networkidle");
      expect(await ranIn(admin)).toBeNull();
      const headers = served!.headers();
      expect(headers["content-security-policy"]).toBe(
        "default-src 'none'; style-src 'unsafe-inline'; sandbox",
      );
      expect(headers["content-disposition"]).toMatch(/^inline; filename="floor-plan\.svg"$/);
      expect(headers["x-content-type-options"]).toBe("nosniff");

      // Drawn in the bench editor.
      await admin.goto(`${baseURL}/benches/${benchId}`);
      await admin.getByRole("application", { name: "Bench canvas" }).waitFor();
      await admin.waitForLoadState("networkidle");
      expect(await ranIn(admin)).toBeNull();

      expect(listenerHits).toEqual([]);
      expect(foreignRequests).toEqual([]);
    });
  }
});
