/**
 * The menu entry a path belongs to: its own entry or the entry whose address
 * it continues (/sources/12 belongs to /sources), the longest such address
 * winning, so /sources/health belongs to its own entry and not to /sources.
 * "/" matches only itself. Null when no entry fits.
 */
export function currentNavTarget(pathname: string, targets: readonly string[]): string | null {
  const path = pathname.length > 1 ? pathname.replace(/\/+$/, "") : pathname;
  let best: string | null = null;
  for (const target of targets) {
    const fits = target === "/" ? path === "/" : path === target || path.startsWith(`${target}/`);
    if (fits && (best === null || target.length > best.length)) best = target;
  }
  return best;
}
