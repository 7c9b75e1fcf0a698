// jsdom ships without types and @types/jsdom is not a dependency; this is the
// one constructor the SVG sanitizer uses: a window with DOMParser, XMLSerializer
// and a document for DOMPurify to work in.
declare module "jsdom" {
  export class JSDOM {
    constructor(html?: string);
    readonly window: Window & typeof globalThis;
  }
}
