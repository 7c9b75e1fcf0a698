import { apiContentSecurityPolicy } from "./http";

/** A comment line every so often keeps proxies from closing a quiet stream. */
const HEARTBEAT_MS = 15_000;

/** What a route writes into its server-sent event stream. */
export interface EventStreamSink {
  /** One `event: <name>` message with `data` as JSON; nothing once the stream is closed. */
  send(event: string, data: unknown): void;
  /** Ends the stream (idempotent): stops the heartbeat and whatever `open` subscribed to. */
  close(): void;
}

export interface EventStreamOptions {
  /**
   * Bytes a viewer may fall behind before its stream is closed, so a viewer
   * that does not read cannot make the server hold an ever longer queue.
   * Unbounded when left out.
   */
  readonly maxBehindBytes?: number;
}

/**
 * A `text/event-stream` response: `open` subscribes the stream to its source
 * and returns how to unsubscribe. The stream closes when the client goes away
 * (abort or cancel), when `sink.close()` is called, or when the viewer falls
 * too far behind; each closes the subscription once. `open` may send and even
 * close at once (a finished run's snapshot).
 */
export function eventStreamResponse(
  request: Request,
  open: (sink: EventStreamSink) => () => void,
  options: EventStreamOptions = {},
): Response {
  const encoder = new TextEncoder();
  let cleanup = () => {};
  const stream = new ReadableStream<Uint8Array>(
    {
      start(controller) {
        let closed = false;
        let unsubscribe: (() => void) | undefined;
        const close = () => {
          if (closed) return;
          closed = true;
          unsubscribe?.();
          clearInterval(heartbeat);
          try {
            controller.close();
          } catch {
            // already closed by the client going away
          }
        };
        const sink: EventStreamSink = {
          send(event, data) {
            if (closed) return;
            const behind = options.maxBehindBytes;
            if (behind !== undefined && (controller.desiredSize ?? 0) < -behind) return close();
            controller.enqueue(
              encoder.encode(`event: ${event}\ndata: ${JSON.stringify(data)}\n\n`),
            );
          },
          close,
        };
        const heartbeat = setInterval(() => {
          if (!closed) controller.enqueue(encoder.encode(": heartbeat\n\n"));
        }, HEARTBEAT_MS);
        cleanup = close;
        request.signal.addEventListener("abort", close);
        const stop = open(sink);
        // Closed while opening: the subscription missed its close, so end it here.
        if (closed) stop();
        else unsubscribe = stop;
      },
      cancel() {
        cleanup();
      },
    },
    { highWaterMark: 0, size: (chunk: Uint8Array) => chunk.byteLength },
  );

  return new Response(stream, {
    headers: {
      "Content-Type": "text/event-stream; charset=utf-8",
      "Cache-Control": "no-store, no-transform",
      Connection: "keep-alive",
      "X-Accel-Buffering": "no",
      "Content-Security-Policy": apiContentSecurityPolicy,
    },
  });
}
