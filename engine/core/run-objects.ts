/**
 * How the engine builds what a run keeps for its whole life (its devices,
 * lines, queues, handlers, the hosts its parts talk through): with `new` or
 * `runArray()` and `push`, never an object or array literal, nor `map` or
 * `filter` (optimized code builds their results like a literal).
 *
 * Why: V8 decides per literal in the source whether to allocate that literal's
 * objects straight into the old generation (allocation-site pretenuring), and
 * it says yes once enough of them outlive a young collection, which a run's
 * records do (a settled template, a live session). A finished replay that left
 * one such old object behind keeps everything that object reaches (every
 * device, the trace, the queue) alive through the next young collections, which
 * copy the dead run and then move it into the old generation to wait for a full
 * collection. Measured on the
 * shipped scenarios: about 32 KB of each replay outlived it that way; built
 * through classes and `runArray`, about 2 KB (DEVELOPERS.md, "Objects a run
 * keeps"). Class instances and `runArray` arrays carry no such decision.
 *
 * Trace events stay literals: a live console keeps 100,000 of them in its ring,
 * and there V8 is right to put them in the old generation at once (as classes
 * the bus benchmark's ring ran about 10 % slower).
 */

/** An empty array for a run to keep and fill; see the module comment for why not `[]`. */
export function runArray<T>(): T[] {
  return Array.of<T>();
}
