/**
 * A byte stream from a worker thread to the main thread over a MessagePort, with backpressure and
 * cancellation both ways:
 *
 * - the worker side is a Writable (`PortWritable`): each chunk is copied into its own buffer and
 *   transferred (not cloned again); once `maxInFlightBytes` are sent and not yet taken by the
 *   reader, its write callback waits, so the producer (exceljs and its zip) feels the same
 *   backpressure as from a slow socket;
 * - the main side is a ReadableStream (`readableFromPort`) that hands a chunk on only when its
 *   reader asks (highWaterMark 0) and acknowledges it then: what the worker may run ahead of the
 *   client is bounded by `maxInFlightBytes`;
 * - cancelling the ReadableStream (the client went away) tells the worker, whose Writable is then
 *   destroyed; a worker that stops (crash, error) closes its port, which ends the stream with an
 *   error.
 *
 * Messages: worker → main `{ type: "chunk", bytes }`, `{ type: "end" }`, `{ type: "error", message }`;
 * main → worker `{ type: "ack", bytes }`, `{ type: "cancel" }`.
 */
import { Writable } from "node:stream";
import type { MessagePort } from "node:worker_threads";

export const DEFAULT_MAX_IN_FLIGHT_BYTES = 4 * 1024 * 1024;

type ToMain = { type: "chunk"; bytes: Uint8Array } | { type: "end" } | { type: "error"; message: string };
type ToWorker = { type: "ack"; bytes: number } | { type: "cancel" };

export class PortWritable extends Writable {
  private inFlight = 0;
  private waiting: ((error?: Error | null) => void) | null = null;

  constructor(
    private readonly port: MessagePort,
    private readonly maxInFlightBytes = DEFAULT_MAX_IN_FLIGHT_BYTES,
  ) {
    super({ highWaterMark: 64 * 1024 });
    port.on("message", (message: ToWorker) => {
      if (message.type === "ack") {
        this.inFlight -= message.bytes;
        if (this.waiting && this.inFlight < this.maxInFlightBytes) {
          const callback = this.waiting;
          this.waiting = null;
          callback();
        }
      } else if (message.type === "cancel") {
        this.destroy();
      }
    });
    port.once("close", () => {
      if (!this.writableFinished) this.destroy();
    });
  }

  /** Bytes sent and not yet taken by the reader (for tests and logs). */
  get bytesInFlight(): number {
    return this.inFlight;
  }

  override _write(chunk: Buffer, _encoding: BufferEncoding, callback: (error?: Error | null) => void): void {
    // A copy of its own: a small Buffer may share its memory with others, which a transfer would detach.
    const bytes = new Uint8Array(chunk.byteLength);
    bytes.set(chunk);
    this.inFlight += bytes.byteLength; // before the transfer empties it
    this.port.postMessage({ type: "chunk", bytes } satisfies ToMain, [bytes.buffer]);
    if (this.inFlight < this.maxInFlightBytes) callback();
    else this.waiting = callback;
  }

  override _final(callback: (error?: Error | null) => void): void {
    this.port.postMessage({ type: "end" } satisfies ToMain);
    callback();
  }

  override _destroy(error: Error | null, callback: (error?: Error | null) => void): void {
    this.waiting = null;
    if (error && !this.writableFinished) {
      try {
        this.port.postMessage({ type: "error", message: error.message } satisfies ToMain);
      } catch {
        // The port is closed already.
      }
    }
    this.port.close();
    callback(error);
  }
}

/**
 * The main side: a ReadableStream of the worker's bytes. `onCancel` runs when the reader cancels
 * (a disconnected client) and also when nothing was read for `stallTimeoutMs` (a client that
 * stopped reading would otherwise hold a worker thread for ever).
 */
export function readableFromPort(
  port: MessagePort,
  opts: { onCancel?: (reason: string) => void; stallTimeoutMs?: number } = {},
): ReadableStream<Uint8Array> {
  const queue: Uint8Array[] = [];
  let ended = false;
  let failure: Error | null = null;
  let wake: (() => void) | null = null;
  let closed = false;
  let stallTimer: ReturnType<typeof setTimeout> | undefined;

  const notify = () => {
    const resume = wake;
    wake = null;
    resume?.();
  };
  const close = () => {
    if (closed) return;
    closed = true;
    clearTimeout(stallTimer);
    port.close();
  };
  const cancel = (reason: string) => {
    if (closed) return;
    try {
      port.postMessage({ type: "cancel" } satisfies ToWorker);
    } catch {
      // Already gone.
    }
    close();
    opts.onCancel?.(reason);
  };
  const armStallTimer = () => {
    if (!opts.stallTimeoutMs) return;
    clearTimeout(stallTimer);
    stallTimer = setTimeout(() => {
      failure = new Error(`The download was stopped: nothing was read for ${Math.round(opts.stallTimeoutMs! / 1000)} s.`);
      cancel("stalled");
      notify();
    }, opts.stallTimeoutMs);
    stallTimer.unref?.();
  };

  port.on("message", (message: ToMain) => {
    if (message.type === "chunk") queue.push(message.bytes);
    else if (message.type === "end") ended = true;
    else failure ??= new Error(message.message);
    notify();
  });
  port.once("close", () => {
    if (!ended) failure ??= new Error("The worker writing this stream stopped before its end.");
    closed = true;
    clearTimeout(stallTimer);
    notify();
  });

  return new ReadableStream<Uint8Array>(
    {
      start() {
        armStallTimer();
      },
      async pull(controller) {
        while (queue.length === 0 && !ended && !failure) await new Promise<void>((resolve) => (wake = resolve));
        const chunk = queue.shift();
        if (chunk) {
          controller.enqueue(chunk);
          if (!closed) {
            port.postMessage({ type: "ack", bytes: chunk.byteLength } satisfies ToWorker);
            armStallTimer();
          }
          return;
        }
        close();
        if (failure) controller.error(failure);
        else controller.close();
      },
      cancel() {
        cancel("cancelled");
      },
    },
    { highWaterMark: 0 },
  );
}
