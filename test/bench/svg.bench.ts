/*
 * Time of the SVG floor-plan sanitizer on adversarial inputs of 0.25, 0.5, 1 and
 * 2 MiB (the upload limit), with the ratio per doubling: a linear sanitizer shows
 * about 2x, a quadratic one about 4x. The regex strip-list it replaced is timed
 * beside it on small inputs only, since it is quadratic (a 160 KB file of spaces
 * took 9 s). Run: npm run bench:svg
 *
 * Times are CPU time of this process (process.cpuUsage), the median of a few
 * rounds, because the machine is shared and wall-clock figures swing with load.
 */
import { sanitizeSvg } from "../../app/api/benches/[benchId]/floor-plan/sanitize-svg";

const SVG_NS = "http://www.w3.org/2000/svg";
const MiB = 1024 * 1024;

/** Inputs built from one repeated unit up to `bytes`, as in the security report. */
const adversarial: Record<string, (bytes: number) => string> = {
  "spaces in an <svg>": (bytes) => `<svg xmlns="${SVG_NS}">${" ".repeat(bytes)}</svg>`,
  "url( in an attribute": (bytes) =>
    `<svg xmlns="${SVG_NS}"><rect fill="${"url(".repeat(bytes / 4)}"/></svg>`,
  "url( in text": (bytes) =>
    `<svg xmlns="${SVG_NS}"><text>${"url( ".repeat(bytes / 5)}</text></svg>`,
  "repeated <!DOCTYPE": (bytes) => "<!DOCTYPE ".repeat(bytes / 10),
};

async function cpuMs(run: () => unknown): Promise<number> {
  const start = process.cpuUsage();
  await run();
  const used = process.cpuUsage(start);
  return (used.user + used.system) / 1000;
}

async function median(run: () => unknown, rounds: number): Promise<number> {
  const times: number[] = [];
  for (let i = 0; i < rounds; i++) times.push(await cpuMs(run));
  times.sort((a, b) => a - b);
  return times[Math.floor(times.length / 2)]!;
}

/** The regex strip-list this sanitizer replaced (quadratic; kept here only to be measured). */
function oldStripList(text: string): string {
  let svg = text;
  svg = svg.replace(/<!DOCTYPE[\s\S]*?(\[[\s\S]*?\])?\s*>/gi, "");
  svg = svg.replace(/<!ENTITY[\s\S]*?>/gi, "");
  for (const element of ["script", "foreignObject", "iframe", "embed", "object"]) {
    svg = svg.replace(new RegExp(`<${element}\\b[\\s\\S]*?<\\/${element}\\s*>`, "gi"), "");
    svg = svg.replace(new RegExp(`<${element}\\b[^>]*\\/?>`, "gi"), "");
  }
  svg = svg.replace(/\s+on[a-z]+\s*=\s*("[^"]*"|'[^']*'|[^\s>]+)/gi, "");
  svg = svg.replace(/\s((?:xlink:)?href|src)\s*=\s*("([^"]*)"|'([^']*)'|([^\s>]+))/gi, "");
  svg = svg.replace(/@import[^;]*;?/gi, "");
  svg = svg.replace(/url\(\s*(['"]?)(.*?)\1\s*\)/gi, "none");
  return svg;
}

const sizes = [0.25, 0.5, 1, 2];
await sanitizeSvg(`<svg xmlns="${SVG_NS}"/>`); // warm up: the jsdom window is made once per process

console.log(
  "SVG sanitizer, CPU ms (median of 3) per input size; x = time / time at half the size\n",
);
console.log(["input".padEnd(24), ...sizes.map((s) => `${s} MiB`.padStart(16))].join(""));
for (const [name, make] of Object.entries(adversarial)) {
  const cells: string[] = [];
  let previous: number | undefined;
  for (const size of sizes) {
    const input = make(size * MiB);
    const ms = await median(() => sanitizeSvg(input), 3);
    const ratio = previous === undefined ? "" : ` (${(ms / previous).toFixed(1)}x)`;
    cells.push(`${ms.toFixed(0)}${ratio}`.padStart(16));
    previous = ms;
  }
  console.log([name.padEnd(24), ...cells].join(""));
}

const smallKiB = [16, 32, 64];
console.log(
  `\nSide by side on small inputs, CPU ms: parser-based sanitizer / old regex strip-list`,
);
console.log(["input".padEnd(24), ...smallKiB.map((k) => `${k} KiB`.padStart(22))].join(""));
for (const [name, make] of Object.entries(adversarial)) {
  const cells: string[] = [];
  let previousOld: number | undefined;
  for (const kib of smallKiB) {
    const input = make(kib * 1024);
    const current = await median(() => sanitizeSvg(input), 3);
    const old = await median(() => oldStripList(input), 1);
    const ratio = previousOld === undefined ? "" : ` (${(old / previousOld).toFixed(1)}x)`;
    cells.push(`${current.toFixed(1)} / ${old.toFixed(0)}${ratio}`.padStart(22));
    previousOld = old;
  }
  console.log([name.padEnd(24), ...cells].join(""));
}
console.log("\n(x) after the old figure: its growth per doubling; about 4x is quadratic.");
