import { serverEnv } from "../env";
import { existingProcessSingleton, processSingleton } from "../process-singleton";
import { sendWeeklyDigests } from "./digest";
import { deliverDueMail, onMailQueued } from "./outbox";

const INTERVAL_MS = 15_000;
const DIGEST_CHECK_MS = 60 * 60_000;

type WorkerState = { timer: NodeJS.Timeout; digestTimer: NodeJS.Timeout; running: boolean; again: boolean };
const WORKER = "mail worker";

function drain(state: WorkerState) {
  if (state.running) {
    state.again = true;
    return;
  }
  state.running = true;
  deliverDueMail()
    .catch((error: unknown) => console.error("[patina] mail delivery failed:", error))
    .finally(() => {
      state.running = false;
      if (state.again) {
        state.again = false;
        drain(state);
      }
    });
}

/** Hourly: queues the weekly digest of every company whose Monday morning has come (once per week and member). */
function queueDueDigests() {
  sendWeeklyDigests(new Date(), { onlyDue: true }).catch((error: unknown) =>
    console.error("[patina] weekly digest failed:", error),
  );
}

/**
 * One sender per server process, started by the server entry: it drains the
 * outbox every few seconds, and at once when the outbox signals queued mail;
 * it never runs inside a request. Tests call deliverDueMail() themselves.
 */
export function ensureMailWorker(): void {
  if (existingProcessSingleton(WORKER) || serverEnv().NODE_ENV === "test") return;
  const state: WorkerState = {
    timer: setInterval(() => drain(state), INTERVAL_MS),
    digestTimer: setInterval(queueDueDigests, DIGEST_CHECK_MS),
    running: false,
    again: false,
  };
  // The intervals must not keep a finished process (a script, a shutdown) alive.
  state.timer.unref();
  state.digestTimer.unref();
  setTimeout(queueDueDigests, 30_000).unref();
  onMailQueued(() => setImmediate(() => drain(state)));
  processSingleton(WORKER, () => state);
}
