import { releaseDeadClaims } from "./imports/claims";
import { ensureMailWorker } from "./mail/worker";
import { processSingleton } from "./process-singleton";

/**
 * Starts the long-running work of a server process. Called once from the
 * server entry; each worker guards itself against a second start (dev reloads).
 */
export function startServerWorkers(): void {
  ensureMailWorker();
  processSingleton("interrupted imports released", releaseInterruptedImports);
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
