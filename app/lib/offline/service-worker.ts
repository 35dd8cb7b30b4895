/// <reference lib="webworker" />
/**
 * Patina's service worker (built by vite-plugin-pwa's injectManifest into
 * /service-worker.js). It keeps the built scripts and styles, and the visit
 * list and visit forms with their data, so a technician can open and fill
 * them without signal. Everything else goes to the network untouched.
 * Saving without signal is the pages' work (app/lib/offline/kept-visits.ts).
 */
import { clientsClaim, type WorkboxPlugin } from "workbox-core";
import { ExpirationPlugin } from "workbox-expiration";
import { cleanupOutdatedCaches, precacheAndRoute } from "workbox-precaching";
import { registerRoute } from "workbox-routing";
import { CacheFirst, NetworkFirst } from "workbox-strategies";
import {
  isKeepVisitPagesMessage,
  isVisitPage,
  type KeepVisitPagesAnswer,
  VISIT_PAGES_CACHE,
  withoutRouteFilter,
} from "./visit-pages";

declare const self: ServiceWorkerGlobalScope & { __WB_MANIFEST: Array<{ url: string; revision: string | null }> };

const DAY_SECONDS = 24 * 60 * 60;
/** A kept page younger than this is not fetched again when a page asks to keep it. */
const FRESH_MS = 60 * 60 * 1000;

void self.skipWaiting();
clientsClaim();
cleanupOutdatedCaches();
precacheAndRoute(self.__WB_MANIFEST);

/** Only complete answers are kept: no redirects (to sign-in), refusals or errors. */
const completeAnswersOnly: WorkboxPlugin = {
  cacheWillUpdate: async ({ response }) =>
    response.status === 200 && response.type === "basic" && !response.redirected ? response : null,
};

/** Without signal, a data request that was never kept as such is answered by the copy with every route's data. */
const answerFromFullCopy: WorkboxPlugin = {
  handlerDidError: async ({ request }) => {
    const cache = await caches.open(VISIT_PAGES_CACHE);
    return (await cache.match(withoutRouteFilter(request.url), { ignoreVary: true })) ?? undefined;
  },
};

const visitPages = new NetworkFirst({
  cacheName: VISIT_PAGES_CACHE,
  // A weak signal in a back garden can hang for long; the kept copy is better than waiting.
  networkTimeoutSeconds: 6,
  matchOptions: { ignoreVary: true },
  plugins: [completeAnswersOnly, new ExpirationPlugin({ maxAgeSeconds: 2 * DAY_SECONDS, maxEntries: 400 }), answerFromFullCopy],
});

registerRoute(({ url, request, sameOrigin }) => sameOrigin && request.method === "GET" && isVisitPage(url), visitPages);

// Hashed build files never change; any not in the precache list (other fonts) are kept once fetched.
registerRoute(
  ({ url, sameOrigin }) => sameOrigin && url.pathname.startsWith("/assets/"),
  new CacheFirst({
    cacheName: "patina-assets",
    plugins: [completeAnswersOnly, new ExpirationPlugin({ maxEntries: 200, maxAgeSeconds: 30 * DAY_SECONDS })],
  }),
);

// Signing out forgets the kept pages: the next person on this phone must not see them.
self.addEventListener("fetch", (event) => {
  const url = new URL(event.request.url);
  if (event.request.method === "POST" && url.origin === self.location.origin && url.pathname.startsWith("/sign-out")) {
    event.waitUntil(caches.delete(VISIT_PAGES_CACHE));
  }
});

async function isFresh(path: string): Promise<boolean> {
  const cache = await caches.open(VISIT_PAGES_CACHE);
  const kept = await cache.match(path, { ignoreVary: true });
  const date = Date.parse(kept?.headers.get("Date") ?? "");
  return Number.isFinite(date) && Date.now() - date < FRESH_MS;
}

/** Fetches and keeps each page, two at a time, skipping those kept recently. */
async function keepPages(paths: string[], event: ExtendableEvent): Promise<KeepVisitPagesAnswer> {
  const answer: KeepVisitPagesAnswer = { kept: 0, failed: 0 };
  const queue = [...new Set(paths)];
  const worker = async () => {
    for (let path = queue.shift(); path !== undefined; path = queue.shift()) {
      try {
        if (!(await isFresh(path))) {
          const response = await visitPages.handle({ event, request: new Request(path, { credentials: "same-origin" }) });
          if (response.status !== 200 || response.redirected) throw new Error(`${path}: ${response.status}`);
        }
        answer.kept++;
      } catch {
        answer.failed++;
      }
    }
  };
  await Promise.all([worker(), worker()]);
  return answer;
}

self.addEventListener("message", (event) => {
  if (!isKeepVisitPagesMessage(event.data) || (event.origin && event.origin !== self.location.origin)) return;
  const port = event.ports[0];
  event.waitUntil(keepPages(event.data.paths, event).then((answer) => port?.postMessage(answer)));
});
