import { ensureMailWorker } from "./mail/worker";

/**
 * Starts the long-running work of a server process. Called once from the
 * server entry; each worker guards itself against a second start (dev reloads).
 */
export function startServerWorkers(): void {
  ensureMailWorker();
}
