import { toSearch } from "~/lib/analytics/params";

export type AnalyticsSearch = Record<string, string | number | null | undefined>;

/** GETs one analytics endpoint; a refusal becomes an Error carrying the API's own message. */
export async function fetchAnalytics<T>(path: string, params: AnalyticsSearch): Promise<T> {
  const response = await fetch(`${path}${toSearch(params)}`, { headers: { Accept: "application/json" } });
  const body = await response.json().catch(() => null);
  if (!response.ok) throw new Error(body?.error?.message ?? `The figures could not be loaded (${response.status}).`);
  return body as T;
}

/** Query keys are the endpoint and its parameters in a stable order. */
export const analyticsKey = (path: string, params: AnalyticsSearch) => [path, toSearch(params)] as const;

/** The loader's answer serves as the hook's data while the parameters are the ones it was loaded for. */
export function sameParams(a: AnalyticsSearch, b: AnalyticsSearch): boolean {
  return toSearch(a) === toSearch(b);
}
