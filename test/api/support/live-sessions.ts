export interface SseEvent {
  readonly event: string;
  readonly data: unknown;
}

/**
 * Reads a server-sent event stream as it arrives. `next` waits (bounded) for
 * the first event that passes `accept`, consuming the ones before it; `close`
 * cancels the stream.
 */
export function sseReader(response: Response) {
  const reader = response.body!.getReader();
  const decoder = new TextDecoder();
  const queue: SseEvent[] = [];
  let buffer = "";
  let done = false;

  async function pull(): Promise<void> {
    const { value, done: finished } = await reader.read();
    if (finished) {
      done = true;
      return;
    }
    buffer += decoder.decode(value, { stream: true });
    let at: number;
    while ((at = buffer.indexOf("\n\n")) >= 0) {
      const block = buffer.slice(0, at);
      buffer = buffer.slice(at + 2);
      if (block.startsWith(":")) continue;
      const lines = block.split("\n");
      const event = lines.find((l) => l.startsWith("event: "))?.slice(7) ?? "message";
      const data = lines.find((l) => l.startsWith("data: "))?.slice(6) ?? "null";
      queue.push({ event, data: JSON.parse(data) as unknown });
    }
  }

  return {
    /** Every event read so far and not yet consumed. */
    get pending(): readonly SseEvent[] {
      return queue;
    },
    get ended(): boolean {
      return done;
    },
    async next(accept: (event: SseEvent) => boolean = () => true, timeoutMs = 5000) {
      const deadline = Date.now() + timeoutMs;
      for (;;) {
        const index = queue.findIndex(accept);
        if (index >= 0) return queue.splice(0, index + 1).at(-1)!;
        queue.length = 0;
        if (done) throw new Error("the stream ended");
        const left = deadline - Date.now();
        if (left <= 0) throw new Error(`no matching event within ${timeoutMs} ms`);
        await Promise.race([
          pull(),
          new Promise((_, reject) =>
            setTimeout(() => reject(new Error(`no matching event within ${timeoutMs} ms`)), left),
          ),
        ]);
      }
    },
    /** Reads until the stream ends (bounded), returning what came. */
    async rest(timeoutMs = 5000): Promise<SseEvent[]> {
      const deadline = Date.now() + timeoutMs;
      while (!done) {
        if (Date.now() > deadline) throw new Error(`the stream did not end within ${timeoutMs} ms`);
        await pull();
      }
      return queue.splice(0);
    },
    close: () => reader.cancel().catch(() => undefined),
  };
}
