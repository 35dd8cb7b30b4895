/** How long a visit may wait on the phone and still be stored at the time it was taken. */
export const KEPT_VISIT_MAX_AGE_MS = 30 * 24 * 60 * 60 * 1000;
/** A phone's clock may run a little ahead of the server's. */
const CLOCK_SKEW_MS = 5 * 60 * 1000;

/**
 * When a visit was taken. A visit kept on the phone without signal carries the
 * moment it was saved there (`takenAt`, ISO 8601); it is used when it lies in
 * the last 30 days and not ahead of the server's clock (a few minutes of skew
 * count as now). Anything else, and a visit sent at once, is taken now.
 */
export function visitTime(takenAt: unknown, now: Date): Date {
  if (typeof takenAt !== "string" || !/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}(\.\d{1,3})?Z$/.test(takenAt)) return now;
  const taken = new Date(takenAt);
  const age = now.getTime() - taken.getTime();
  if (!Number.isFinite(age) || age > KEPT_VISIT_MAX_AGE_MS || age < -CLOCK_SKEW_MS) return now;
  return age < 0 ? now : taken;
}
