import { existsSync, readdirSync, statSync } from "node:fs";
import { isAbsolute, join, relative, resolve, sep } from "node:path";
import { err, ok, type Result } from "../core/result";

/**
 * The CLI's file arguments as the scenario and suite files to run. A file is
 * itself; a folder is every *.json scenario or suite directly in it; a pattern
 * with * ? ** [..] or {a,b} is expanded here, because a shell may pass it on
 * unexpanded (Windows, quoted arguments, npm scripts). Bench files
 * (*.bench.json) are never run, so folders and patterns leave them out.
 * Results are absolute, sorted within each argument and without duplicates.
 */
export function expandInputs(inputs: readonly string[], cwd: string): Result<string[], string> {
  const seen = new Set<string>();
  const files: string[] = [];
  const add = (file: string) => {
    if (seen.has(file)) return;
    seen.add(file);
    files.push(file);
  };
  for (const input of inputs) {
    const absolute = isAbsolute(input) ? input : resolve(cwd, input);
    if (!hasGlob(input)) {
      if (existsSync(absolute) && statSync(absolute).isDirectory()) {
        const inFolder = readdirSync(absolute)
          .filter((name) => runnableName(name))
          .filter((name) => statSync(join(absolute, name)).isFile())
          .sort()
          .map((name) => join(absolute, name));
        if (inFolder.length === 0)
          return err(`${input}: no scenario or suite files (*.json) in the folder`);
        inFolder.forEach(add);
      } else {
        // A missing file is reported by the reader with the usual "cannot read the file".
        add(absolute);
      }
      continue;
    }
    const matched = globFiles(input, cwd);
    if (matched.length === 0) return err(`${input}: no scenario or suite file matches`);
    matched.forEach(add);
  }
  return ok(files);
}

const GLOB_CHARS = /[*?[{]/;

function hasGlob(text: string): boolean {
  return GLOB_CHARS.test(text);
}

function runnableName(name: string): boolean {
  return name.endsWith(".json") && !name.endsWith(".bench.json");
}

/** Files matching the pattern, found by walking from its longest literal folder. */
function globFiles(pattern: string, cwd: string): string[] {
  const normalized = pattern.split(/[\\/]+/);
  const firstGlob = normalized.findIndex(hasGlob);
  const literal = normalized.slice(0, firstGlob);
  const rest = normalized.slice(firstGlob);
  const base = isAbsolute(pattern)
    ? resolve(sep, ...literal)
    : resolve(cwd, ...(literal.length > 0 ? literal : ["."]));
  if (!existsSync(base) || !statSync(base).isDirectory()) return [];
  const matcher = segmentsRegExp(rest);
  const deep = rest.includes("**");
  const found: string[] = [];
  const walk = (folder: string, depth: number) => {
    for (const entry of readdirSync(folder, { withFileTypes: true }).sort((a, b) =>
      a.name.localeCompare(b.name),
    )) {
      // Hidden folders and installed packages are never scenario folders.
      if (entry.name.startsWith(".") || entry.name === "node_modules") continue;
      const path = join(folder, entry.name);
      if (entry.isDirectory()) {
        if (deep || depth + 1 < rest.length) walk(path, depth + 1);
      } else if (entry.isFile() && !entry.name.endsWith(".bench.json")) {
        const relativePath = relative(base, path).split(sep).join("/");
        if (matcher.test(relativePath)) found.push(path);
      }
    }
  };
  walk(base, 0);
  return found;
}

/** A regular expression for "/"-separated glob segments, matched against a relative path. */
export function segmentsRegExp(segments: readonly string[]): RegExp {
  const parts = segments.map((segment) =>
    segment === "**" ? "(?:[^/]+/)*" : `${segmentSource(segment)}/`,
  );
  // The last segment carries no trailing slash; a final "**" matches any file below.
  const joined = parts.join("");
  const source = joined.endsWith("(?:[^/]+/)*") ? `${joined}[^/]+` : joined.slice(0, -1);
  return new RegExp(`^${source}$`);
}

function segmentSource(segment: string): string {
  let out = "";
  for (let i = 0; i < segment.length; i += 1) {
    const char = segment[i]!;
    if (char === "*") out += "[^/]*";
    else if (char === "?") out += "[^/]";
    else if (char === "[") {
      const close = segment.indexOf("]", i + 1);
      if (close < 0) {
        out += "\\[";
        continue;
      }
      const body = segment
        .slice(i + 1, close)
        .replace(/^!/, "^")
        .replace(/\\/g, "\\\\");
      out += `[${body}]`;
      i = close;
    } else if (char === "{") {
      const close = segment.indexOf("}", i + 1);
      if (close < 0) {
        out += "\\{";
        continue;
      }
      const options = segment
        .slice(i + 1, close)
        .split(",")
        .map((option) => segmentSource(option));
      out += `(?:${options.join("|")})`;
      i = close;
    } else out += char.replace(/[.+^$()|\\\]}]/g, "\\$&");
  }
  return out;
}
