import { useEffect, useState, useSyncExternalStore } from "react";
import { KEEP_VISIT_PAGES, type KeepVisitPagesAnswer, type KeepVisitPagesMessage } from "./visit-pages";

export type KeepState = { state: "starting" | "failed" } | { state: "kept"; answer: KeepVisitPagesAnswer };

/** Registers the service worker (once per page load is enough; the browser dedupes) and waits until it is active. */
async function activeWorker(): Promise<ServiceWorker> {
  await navigator.serviceWorker.register("/service-worker.js", { scope: "/" });
  const registration = await navigator.serviceWorker.ready;
  if (!registration.active) throw new Error("no active service worker");
  return registration.active;
}

function ask(worker: ServiceWorker, message: KeepVisitPagesMessage): Promise<KeepVisitPagesAnswer> {
  return new Promise((resolve, reject) => {
    const channel = new MessageChannel();
    const timer = window.setTimeout(() => reject(new Error("the service worker did not answer")), 120_000);
    channel.port1.onmessage = (event: MessageEvent<KeepVisitPagesAnswer>) => {
      window.clearTimeout(timer);
      resolve(event.data);
    };
    worker.postMessage(message, [channel.port2]);
  });
}

/**
 * Asks the service worker to keep these visit pages for use without signal
 * (it fetches those it has not kept in the last hour). Does nothing offline:
 * what was kept earlier stays.
 */
export function useKeptPages(paths: readonly string[]): KeepState {
  const [keep, setKeep] = useState<KeepState>({ state: "starting" });
  const joined = paths.join("\n");
  useEffect(() => {
    // Without service workers (or without signal) nothing is kept now; the pages still work online.
    if (!("serviceWorker" in navigator) || !navigator.onLine) return;
    let current = true;
    activeWorker()
      .then((worker) => ask(worker, { type: KEEP_VISIT_PAGES, paths: joined.split("\n") }))
      .then(
        (answer) => current && setKeep({ state: "kept", answer }),
        () => current && setKeep({ state: "failed" }),
      );
    return () => {
      current = false;
    };
  }, [joined]);
  return keep;
}

function subscribeOnline(onChange: () => void) {
  window.addEventListener("online", onChange);
  window.addEventListener("offline", onChange);
  return () => {
    window.removeEventListener("online", onChange);
    window.removeEventListener("offline", onChange);
  };
}

/** Whether the phone says it is online; the server's rendering assumes it is. */
export function useOnline(): boolean {
  return useSyncExternalStore(subscribeOnline, () => navigator.onLine, () => true);
}
