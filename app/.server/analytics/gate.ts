import { serverEnv } from "../env";
import { RequestAbandoned } from "../request-context";

export type GateLimits = { concurrency: number; queue: number; waitMs: number };

/** Why a request was not let in: the queue was full, or its wait ran out. */
export class GateRefused extends Error {
  constructor(readonly reason: "queue-full" | "waited-too-long") {
    super(
      reason === "queue-full"
        ? "The analytics are busy with other requests; try again in a few seconds."
        : "The analytics stayed busy for too long; try again in a few seconds.",
    );
    this.name = "GateRefused";
  }
}

type Waiter = { admit: (release: () => void) => void; refuse: (error: Error) => void };

/**
 * At most `concurrency` holders at once; up to `queue` more wait in arrival
 * order (each at most `waitMs`, and only while its client is still there);
 * anyone beyond that is refused at once.
 */
export class ConcurrencyGate {
  private running = 0;
  private readonly waiting: Waiter[] = [];

  constructor(private readonly limits: () => GateLimits) {}

  get stats() {
    return { running: this.running, waiting: this.waiting.length };
  }

  /** Resolves with the slot's release function; call it exactly once. */
  enter(signal?: AbortSignal): Promise<() => void> {
    if (signal?.aborted) return Promise.reject(new RequestAbandoned());
    const { concurrency, queue, waitMs } = this.limits();
    if (this.running < concurrency && this.waiting.length === 0) {
      this.running++;
      return Promise.resolve(this.releaser());
    }
    if (this.waiting.length >= queue) return Promise.reject(new GateRefused("queue-full"));
    return new Promise((resolve, reject) => {
      const leave = (error: Error) => {
        const at = this.waiting.indexOf(waiter);
        if (at >= 0) this.waiting.splice(at, 1);
        clearTimeout(timer);
        signal?.removeEventListener("abort", onAbort);
        reject(error);
      };
      const onAbort = () => leave(new RequestAbandoned());
      const timer = setTimeout(() => leave(new GateRefused("waited-too-long")), waitMs);
      const waiter: Waiter = {
        admit: (release) => {
          clearTimeout(timer);
          signal?.removeEventListener("abort", onAbort);
          resolve(release);
        },
        refuse: leave,
      };
      signal?.addEventListener("abort", onAbort, { once: true });
      this.waiting.push(waiter);
    });
  }

  private releaser(): () => void {
    let released = false;
    return () => {
      if (released) return;
      released = true;
      const next = this.waiting.shift();
      // The slot passes straight to the next in line, so `running` stays the same.
      if (next) next.admit(this.releaser());
      else this.running--;
    };
  }
}

const holder = globalThis as typeof globalThis & { __patinaAnalyticsGate?: ConcurrencyGate };

/** The instance's one gate for heavy analytics (limits from the environment). */
export function analyticsGate(): ConcurrencyGate {
  holder.__patinaAnalyticsGate ??= new ConcurrencyGate(() => {
    const env = serverEnv();
    return { concurrency: env.PATINA_ANALYTICS_CONCURRENCY, queue: env.PATINA_ANALYTICS_QUEUE, waitMs: env.PATINA_ANALYTICS_QUEUE_WAIT_MS };
  });
  return holder.__patinaAnalyticsGate;
}
