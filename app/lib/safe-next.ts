const BASE = "http://patina.invalid";

/**
 * Where to go after sign-in: only a path on this site. Parsed as the browser
 * would, so "/\host", "//host" and paths with tabs or newlines (which browsers
 * strip, turning "/\t/host" into "//host") never leave the origin.
 */
export function safeNext(next: string | null | undefined): string {
  if (!next || !next.startsWith("/")) return "/";
  let url: URL;
  try {
    url = new URL(next, BASE);
  } catch {
    return "/";
  }
  if (url.origin !== BASE) return "/";
  const path = url.pathname + url.search + url.hash;
  // The WHATWG parser already removed tabs and newlines; what remains must still be one path.
  return path.startsWith("//") || path.startsWith("/\\") ? "/" : path;
}
