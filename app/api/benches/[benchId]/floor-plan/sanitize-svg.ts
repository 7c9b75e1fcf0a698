import type { DOMPurify } from "dompurify";

/**
 * Makes an uploaded SVG floor plan inert before it is stored. The file is
 * parsed as XML (image/svg+xml, as the browser will read it), so namespace
 * prefixes, entities and character references mean what they mean to the
 * browser; then DOMPurify walks the tree with its SVG allow-list. What is left
 * is drawing only: no script, no event handler, no foreign content, no
 * animation, no <style>, and no reference to anything outside the file
 * (href only to "#id", url() only to "#id"). A file that is not well-formed
 * XML with an <svg> root is refused, not repaired.
 *
 * Linear in the input: one XML parse, one tree walk, one serialisation, and
 * the few value checks below scan each attribute once without backtracking.
 */
export interface SanitizedSvg {
  readonly svg: string;
  /** What was removed, for the upload's answer ("script", "event handler", ...). */
  readonly removed: readonly string[];
}

export type SvgRefusal = { readonly refused: string };

const SVG_NS = "http://www.w3.org/2000/svg";
const XLINK_NS = "http://www.w3.org/1999/xlink";
const XML_NS = "http://www.w3.org/XML/1998/namespace";

// Animation can set any attribute (an event handler, an href) after the
// allow-list has looked; <style> can import and fetch. A floor plan needs none.
const forbiddenTags = [
  "style",
  "animate",
  "animatecolor",
  "animatemotion",
  "animatetransform",
  "set",
  "mpath",
  "discard",
];

let purifier: { purify: DOMPurify; window: Window & typeof globalThis } | undefined;

/**
 * One jsdom window and DOMPurify instance per process: building a window costs
 * far more than a file. Loaded on the first upload, not when the route module
 * is, since jsdom takes a second or two to load.
 */
async function instance() {
  if (purifier) return purifier;
  const [{ JSDOM }, { default: createDOMPurify }] = await Promise.all([
    import("jsdom"),
    import("dompurify"),
  ]);
  const window = new JSDOM("").window;
  const purify = createDOMPurify(window);
  purify.addHook("uponSanitizeAttribute", (_node, event) => {
    if (!event.keepAttr) return;
    if (!isSafeAttribute(event.attrName, event.attrValue)) event.keepAttr = false;
  });
  purifier = { purify, window };
  return purifier;
}

/** href only to a fragment of this file; url() only to a fragment; no CSS escapes hiding either. */
export function isSafeAttribute(name: string, value: string): boolean {
  const local = name.slice(name.indexOf(":") + 1).toLowerCase();
  if (local.startsWith("on")) return false;
  if (local === "href" || local === "src") return value.trim().startsWith("#");
  const lower = value.toLowerCase();
  // A backslash is a CSS escape ("u\72l(") in style and presentation attributes.
  if (lower.includes("\\") || lower.includes("@import")) return false;
  return onlyFragmentUrls(lower);
}

/** Every url( in the value points at "#...". One pass, no backtracking. */
function onlyFragmentUrls(value: string): boolean {
  let from = 0;
  for (;;) {
    const at = value.indexOf("url(", from);
    if (at === -1) return true;
    let i = at + 4;
    while (i < value.length && /[\s'"]/.test(value[i]!)) i++;
    if (value[i] !== "#") return false;
    from = i;
  }
}

/**
 * Rebuild the parsed tree without namespace prefixes: an SVG element written
 * as <svg:script> becomes <script>, so the allow-list sees its real name, and
 * elements or attributes from any other namespace (XHTML, editor metadata)
 * are dropped before DOMPurify runs.
 */
function normalised(source: Element, target: Document, removed: Set<string>): Element | null {
  const element = normalisedShallow(source, target, removed);
  if (!element) return null;
  // An explicit stack rather than recursion: deep nesting must not overflow.
  const stack: [Node, Element][] = [];
  for (let child = source.lastChild; child; child = child.previousSibling)
    stack.push([child, element]);
  while (stack.length > 0) {
    const [node, parent] = stack.pop()!;
    if (node.nodeType === 3 || node.nodeType === 4) {
      parent.appendChild(target.createTextNode(node.nodeValue ?? ""));
    } else if (node.nodeType === 1) {
      const child = normalisedShallow(node as Element, target, removed);
      if (!child) continue;
      parent.appendChild(child);
      for (let grand = node.lastChild; grand; grand = grand.previousSibling)
        stack.push([grand, child]);
    } else if (node.nodeType === 7) {
      removed.add("processing instruction");
    }
  }
  return element;
}

function normalisedShallow(source: Element, target: Document, removed: Set<string>) {
  if (source.namespaceURI !== SVG_NS) {
    removed.add(`foreign element ${source.localName}`);
    return null;
  }
  const element = target.createElementNS(SVG_NS, source.localName);
  for (const attribute of Array.from(source.attributes)) {
    if (attribute.namespaceURI === null) element.setAttribute(attribute.localName, attribute.value);
    else if (attribute.namespaceURI === XLINK_NS)
      element.setAttributeNS(XLINK_NS, `xlink:${attribute.localName}`, attribute.value);
    else if (attribute.namespaceURI === XML_NS)
      element.setAttributeNS(XML_NS, `xml:${attribute.localName}`, attribute.value);
    else if (attribute.namespaceURI !== "http://www.w3.org/2000/xmlns/")
      removed.add("foreign attribute");
  }
  return element;
}

function describeRemoval(entry: { element?: Node; attribute?: Attr | null }): string {
  if ("attribute" in entry && entry.attribute) {
    const name = entry.attribute.name.toLowerCase();
    const local = name.slice(name.indexOf(":") + 1);
    if (local.startsWith("on")) return "event handler";
    if (local === "href" || local === "src" || /url\(|@import/.test(entry.attribute.value))
      return "external reference";
    return `attribute ${entry.attribute.name}`;
  }
  const element = entry.element as Element | undefined;
  const name = element?.localName ?? element?.nodeName ?? "node";
  if (name === "script") return "script";
  if (element?.nodeType === 8) return "comment";
  return `element ${name}`;
}

/** The cleaned SVG, or why the file is refused. */
export async function sanitizeSvg(text: string): Promise<SanitizedSvg | SvgRefusal> {
  // An entity declared in the file can be referenced a million times, each
  // reference copying its whole text: refused before parsing. (Character
  // references like &#106; and the five built-in entities are fine.)
  if (text.includes("<!ENTITY")) {
    return { refused: "the file declares XML entities; save the SVG without a DOCTYPE" };
  }
  const { purify, window } = await instance();
  const parsed = new window.DOMParser().parseFromString(text, "image/svg+xml");
  const root = parsed.documentElement;
  if (
    !root ||
    root.getElementsByTagNameNS("*", "parsererror").length > 0 ||
    root.localName === "parsererror"
  ) {
    return { refused: "the file is not well-formed SVG (XML) text" };
  }
  if (root.namespaceURI !== SVG_NS || root.localName !== "svg") {
    return {
      refused:
        'the file\'s root element is not <svg> in the SVG namespace ("http://www.w3.org/2000/svg")',
    };
  }
  const removed = new Set<string>();
  if (parsed.doctype) removed.add("document type");
  const clean = normalised(root, window.document, removed);
  if (!clean) return { refused: "the file has no <svg> element" };
  const body = purify.sanitize(clean, {
    USE_PROFILES: { svg: true, svgFilters: true },
    // <use> is left out of the SVG profile for its external references; here
    // its href can only be "#id" (isSafeAttribute), which is what plans use it for.
    ADD_TAGS: ["use"],
    FORBID_TAGS: forbiddenTags,
    RETURN_DOM: true,
  });
  for (const entry of purify.removed) {
    // The wrapper DOMPurify puts the tree in is listed too; it was never in the file.
    if ("element" in entry && entry.element.nodeName === "BODY") continue;
    removed.add(describeRemoval(entry));
  }
  const svg = body.firstElementChild;
  if (!svg || svg.namespaceURI !== SVG_NS || svg.localName !== "svg") {
    return { refused: "nothing of the drawing is left once scripts and references are removed" };
  }
  return {
    svg: new window.XMLSerializer().serializeToString(svg),
    removed: [...removed].sort(),
  };
}
