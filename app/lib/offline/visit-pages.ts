/**
 * Which requests the service worker keeps for use without signal: the visit
 * list and each pool's visit form, both as pages and as the data React Router
 * fetches when it moves between them (`/visit.data`, `/visit/12.data`).
 * Shared by the worker and the pages, so both name the same addresses.
 */

export const VISIT_PAGES_CACHE = "patina-visit-pages";

/** The message a page sends to the worker: keep these addresses, answer on the given port. */
export const KEEP_VISIT_PAGES = "keep-visit-pages";

export type KeepVisitPagesMessage = { type: typeof KEEP_VISIT_PAGES; paths: string[] };
export type KeepVisitPagesAnswer = { kept: number; failed: number };

const VISIT_PAGE = /^\/visit(?:\/\d+)?(?:\.data)?$/;

export function isVisitPage(url: URL): boolean {
  return VISIT_PAGE.test(url.pathname);
}

/**
 * React Router names the routes it wants in `_routes` when it loads only some
 * of a page's data; a copy kept with every route's data answers such a request
 * too, so it is the one looked up when the exact address was never kept.
 */
export function withoutRouteFilter(url: string): string {
  const copy = new URL(url);
  copy.searchParams.delete("_routes");
  return copy.href;
}

/** The pages and data a technician needs without signal: the list, and the form of each pool on it. */
export function visitPagesFor(poolIds: readonly number[], withList: boolean): string[] {
  const forms = poolIds.flatMap((id) => [`/visit/${id}`, `/visit/${id}.data`]);
  return withList ? ["/visit", "/visit.data", ...forms] : forms;
}

export function isKeepVisitPagesMessage(data: unknown): data is KeepVisitPagesMessage {
  if (typeof data !== "object" || data === null) return false;
  const { type, paths } = data as Partial<KeepVisitPagesMessage>;
  return (
    type === KEEP_VISIT_PAGES &&
    Array.isArray(paths) &&
    paths.length <= 500 &&
    paths.every((p) => typeof p === "string" && isVisitPage(new URL(p, "http://patina.invalid")))
  );
}
