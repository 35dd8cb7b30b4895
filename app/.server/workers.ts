import { releaseDeadClaims } from "./imports/claims";
import { runLapsedJobs } from "./jobs/sweeper";
import { serverEnv } from "./env";
import { ensureMailWorker } from "./mail/worker";
import { processSingleton } from "./process-singleton";

/** How often each instance looks for background jobs left by an instance that died. */
const SWEEP_MS = 30_000;

/**
 * Starts the long-running work of a server process. Called once from the
 * server entry; each worker guards itself against a second start (dev reloads).
 * Every instance runs the same workers: what must happen once (a message, a
 * digest, an alert check) is claimed in the database first.
 */
export function startServerWorkers(): void {
  ensureMailWorker();
  processSingleton("interrupted imports released", releaseInterruptedImports);
  if (serverEnv().NODE_ENV !== "test") processSingleton("background job sweeper", startJobSweeper);
}

// Commits left by a process of this host that is gone (or by any process, past
// the claim timeout) are marked stopped, so they can be committed again.
function releaseInterruptedImports(): Promise<void> {
  return releaseDeadClaims()
    .then((released) => {
      if (released > 0) console.log(`[patina] ${released} interrupted import(s) marked stopped; nothing of them was stored`);
    })
    .catch((error: unknown) => console.error("[patina] could not release interrupted imports:", error));
}

function startJobSweeper(): NodeJS.Timeout {
  let running = false;
  const sweep = () => {
    if (running) return;
    running = true;
    runLapsedJobs()
      .then((report) => {
        if (report.taken > 0) console.log(`[patina] took over ${report.taken} background job(s) left by another instance`);
      })
      .catch((error: unknown) => console.error("[patina] background job sweep failed:", error))
      .finally(() => {
        running = false;
      });
  };
  // Instances started together would sweep in step; a random offset spreads them.
  const timer = setInterval(sweep, SWEEP_MS + Math.floor(Math.random() * 5_000));
  timer.unref();
  return timer;
}
