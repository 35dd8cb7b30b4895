/**
 * The origins Patina answers on: the public one (PATINA_URL) and, for a
 * server reached on localhost, both local spellings of the same port.
 */
export function firstPartyOrigins(baseUrl: string): string[] {
  const url = new URL(baseUrl);
  const port = url.port ? `:${url.port}` : "";
  return [
    ...new Set([
      url.origin,
      `${url.protocol}//localhost${port}`,
      `${url.protocol}//127.0.0.1${port}`,
    ]),
  ];
}
