/**
 * How deeply a request body's JSON may nest. Benchline's documents nest about
 * eight levels (a bench's device, its parameters, a list inside them); 64 is
 * far beyond any real document and far below what parsing, validating and
 * walking a value recursively can take without overflowing the stack.
 */
export const maxJsonDepth = 64;

export interface JsonShapeProblem {
  /** The field at fault, as errors.ts names fields ("steps[0].value"). */
  readonly field: string;
  readonly message: string;
}

/**
 * What is wrong with the shape of a JSON text before it is parsed: a value
 * nested deeper than `maxDepth`, or an object naming the same key twice
 * (JSON.parse would keep the last silently, while another reader of the same
 * body might keep the first). One pass with explicit stacks, so it is linear
 * and cannot overflow; JSON.parse judges the syntax afterwards.
 */
export function jsonShapeProblem(text: string, maxDepth = maxJsonDepth): JsonShapeProblem | null {
  // Per open container: whether it is an array, the key or index being read in
  // it, and (objects) the keys seen so far.
  const isArray: boolean[] = [];
  const at: (string | number)[] = [];
  const seen: (Set<string> | null)[] = [];
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
      if (isArray.length >= maxDepth) {
        const field = pathOf(at, true);
        return { field, message: `${field}: nested deeper than ${maxDepth} levels` };
      }
      isArray.push(c === 0x5b);
      at.push(c === 0x5b ? 0 : "");
      seen.push(c === 0x5b ? null : new Set());
    } else if (c === 0x7d /* } */ || c === 0x5d /* ] */) {
      isArray.pop();
      at.pop();
      seen.pop();
    } else if (c === 0x2c /* , */ && isArray.at(-1) === true) {
      at[at.length - 1] = (at.at(-1) as number) + 1;
    } else if (c === 0x3a /* : */ && isArray.at(-1) === false && lastString) {
      const key = keyText(text.slice(lastString[0], lastString[1]));
      at[at.length - 1] = key;
      const keys = seen.at(-1)!;
      if (keys.has(key)) {
        const field = pathOf(at, false);
        return { field, message: `${field}: the field "${shortened(key)}" appears twice` };
      }
      keys.add(key);
    }
  }
  return null;
}

function keyText(quoted: string): string {
  try {
    return JSON.parse(quoted) as string;
  } catch {
    return quoted.slice(1, -1);
  }
}

function shortened(key: string): string {
  return key.length > 60 ? `${key.slice(0, 60)}…` : key;
}

/**
 * A field path as errors.ts writes it; for runaway nesting, down to the last
 * named key without the chain of indices below it ("steps[0].value", not
 * "steps[0].value[0][0][0]..."); "(body)" when the body itself is the chain.
 */
function pathOf(at: readonly (string | number)[], trimIndices: boolean): string {
  let end = at.length;
  while (trimIndices && end > 0 && typeof at[end - 1] === "number") end--;
  let out = "";
  for (const part of at.slice(0, end)) {
    if (typeof part === "number") out += `[${part}]`;
    else out += out === "" ? shortened(part) : `.${shortened(part)}`;
  }
  return out === "" ? "(body)" : out;
}
