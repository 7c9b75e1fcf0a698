/**
 * How deeply a request body's JSON may nest. Benchline's documents nest about
 * eight levels (a bench's device, its parameters, a list inside them); 64 is
 * far beyond any real document and far below what parsing, validating and
 * walking a value recursively can take without overflowing the stack.
 */
export const maxJsonDepth = 64;

/**
 * The path of the first value in `text` nested deeper than `maxDepth`
 * ("steps[0].value"), or null when none is. One pass over the text with an
 * explicit stack, so it is linear and cannot overflow whatever the input; it
 * judges nesting only, JSON.parse judges the syntax afterwards.
 */
export function tooDeeplyNestedAt(text: string, maxDepth = maxJsonDepth): string | null {
  // Per open container: whether it is an array, and the key or index being read in it.
  const isArray: boolean[] = [];
  const at: (string | number)[] = [];
  let lastString: [number, number] | null = null;
  const length = text.length;
  for (let i = 0; i < length; i++) {
    const c = text.charCodeAt(i);
    if (c === 0x22 /* " */) {
      const start = i;
      for (i++; i < length; i++) {
        const d = text.charCodeAt(i);
        if (d === 0x5c /* \ */) i++;
        else if (d === 0x22) break;
      }
      lastString = [start, i + 1];
    } else if (c === 0x7b /* { */ || c === 0x5b /* [ */) {
      if (isArray.length >= maxDepth) return pathOf(at);
      isArray.push(c === 0x5b);
      at.push(c === 0x5b ? 0 : "");
    } else if (c === 0x7d /* } */ || c === 0x5d /* ] */) {
      isArray.pop();
      at.pop();
    } else if (c === 0x2c /* , */ && isArray.at(-1) === true) {
      at[at.length - 1] = (at.at(-1) as number) + 1;
    } else if (c === 0x3a /* : */ && isArray.at(-1) === false && lastString) {
      at[at.length - 1] = keyText(text.slice(lastString[0], lastString[1]));
    }
  }
  return null;
}

function keyText(quoted: string): string {
  let key: string;
  try {
    key = JSON.parse(quoted) as string;
  } catch {
    key = quoted.slice(1, -1);
  }
  return key.length > 60 ? `${key.slice(0, 60)}…` : key;
}

/**
 * The field that holds the runaway nesting: the path down to the last named
 * key, without the chain of indices below it ("steps[0].value", not
 * "steps[0].value[0][0][0]..."); "(body)" when the body itself is the chain.
 */
function pathOf(at: readonly (string | number)[]): string {
  let end = at.length;
  while (end > 0 && typeof at[end - 1] === "number") end--;
  let out = "";
  for (const part of at.slice(0, end)) {
    if (typeof part === "number") out += `[${part}]`;
    else out += out === "" ? part : `.${part}`;
  }
  return out === "" ? "(body)" : out;
}
