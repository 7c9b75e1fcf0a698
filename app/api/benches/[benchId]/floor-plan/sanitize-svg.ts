/**
 * Makes an uploaded SVG floor plan inert before it is stored: scripts,
 * foreign content, event-handler attributes, document type declarations
 * (entity expansion) and every reference to something outside the file are
 * removed. It is a strip-list over the markup, which is enough because the
 * image is also only ever served with a script-free Content-Security-Policy
 * and drawn through <img>, where browsers run no script and fetch nothing.
 */
export interface SanitizedSvg {
  readonly svg: string;
  /** What was removed, for the upload's answer. */
  readonly removed: readonly string[];
}

const DROP_ELEMENTS = [
  "script",
  "foreignObject",
  "iframe",
  "embed",
  "object",
  "audio",
  "video",
  "handler",
  "listener",
];

export function sanitizeSvg(text: string): SanitizedSvg | null {
  const removed = new Set<string>();
  let svg = text;
  const strip = (pattern: RegExp, what: string) => {
    svg = svg.replace(pattern, () => {
      removed.add(what);
      return "";
    });
  };
  strip(/<!DOCTYPE[\s\S]*?(\[[\s\S]*?\])?\s*>/gi, "document type");
  strip(/<!ENTITY[\s\S]*?>/gi, "entity");
  strip(/<\?xml-stylesheet[\s\S]*?\?>/gi, "stylesheet reference");
  for (const element of DROP_ELEMENTS) {
    strip(new RegExp(`<${element}\\b[\\s\\S]*?<\\/${element}\\s*>`, "gi"), element);
    strip(new RegExp(`<${element}\\b[^>]*\\/?>`, "gi"), element);
  }
  // Event handlers: onload=, onclick=, ... in any quoting.
  strip(/\s+on[a-z]+\s*=\s*("[^"]*"|'[^']*'|[^\s>]+)/gi, "event handler");
  // Links and references: only in-document fragments (#id) and embedded raster data stay.
  svg = svg.replace(
    /\s((?:xlink:)?href|src)\s*=\s*("([^"]*)"|'([^']*)'|([^\s>]+))/gi,
    (match, _name, _v, dq, sq, bare) => {
      const value = String(dq ?? sq ?? bare ?? "").trim();
      if (value.startsWith("#") || /^data:image\/(png|jpeg);base64,[a-z0-9+/=\s]*$/i.test(value))
        return match;
      removed.add("external reference");
      return "";
    },
  );
  // CSS can fetch too: url(...) to anything but a fragment, and @import.
  strip(/@import[^;]*;?/gi, "stylesheet import");
  svg = svg.replace(/url\(\s*(['"]?)(.*?)\1\s*\)/gi, (match, _q, target: string) => {
    if (target.trim().startsWith("#")) return match;
    removed.add("external reference");
    return "none";
  });
  strip(/javascript:/gi, "script URL");
  if (!/<svg\b/i.test(svg)) return null;
  return { svg, removed: [...removed] };
}
