import { z } from "zod";
import { METALS, type MetalThresholds } from "@analysis/metals/reading";
import { GROUPING_KEYS } from "@analysis/stats/groups";
import { isCalendarDay, plainPositiveInt } from "../strict-params";

/**
 * Query parameters shared by the analytics pages and the JSON API. Both sides
 * parse the URL with the same schemas, so a bookmark and an API call mean the
 * same thing, and the hooks build their URLs from the same names.
 */

const ISO_DAY = /^\d{4}-\d{2}-\d{2}$/;

/** An empty parameter ("" or null) is read as left out. */
const blankAsAbsent = (v: unknown) => (v === "" || v === null ? undefined : v);

const oneOf = <T extends string>(values: readonly T[]) =>
  z.enum(values as [T, ...T[]], { error: `must be one of ${values.join(", ")}` });

/** One of `values`, or `fallback` when left out or empty. */
const choiceOr = <T extends string>(values: readonly T[], fallback: NoInfer<T>) =>
  z.preprocess((v) => blankAsAbsent(v) ?? fallback, oneOf(values));

const day = z.preprocess(
  blankAsAbsent,
  z
    .string()
    .regex(ISO_DAY, { error: "must be a date written YYYY-MM-DD" })
    .refine(isCalendarDay, { error: "is not a calendar date" })
    .optional(),
);

const positiveId = (name: string) =>
  z.preprocess(
    (v) => (v === "" || v === null ? undefined : (plainPositiveInt(v) ?? v)),
    z
      .number({ error: `${name} must be a positive whole number written in digits (like 12)` })
      .int({ error: "must be a whole number" })
      .positive({ error: "must be positive" })
      .optional(),
  );

const level = z.preprocess(
  blankAsAbsent,
  z.coerce
    .number({ error: "must be a number in mg/L" })
    .gt(0, { error: "must be above 0 mg/L" })
    .max(10, { error: "must be at most 10 mg/L" })
    .optional(),
);

const wholeDays = (max: number) =>
  z.preprocess(
    blankAsAbsent,
    z.coerce
      .number({ error: "must be a number of days" })
      .int({ error: "must be a whole number of days" })
      .min(1, { error: "must be at least 1 day" })
      .max(max, { error: `must be at most ${max} days` })
      .optional(),
  );

export const metalParam = z.preprocess(blankAsAbsent, oneOf(METALS).optional());

/** Date window and route: every analytics question takes these. */
export const windowShape = {
  from: day,
  to: day,
  route: positiveId("route"),
};

export const thresholdShape = {
  copperElevated: level,
  copperClear: level,
  ironElevated: level,
  ironClear: level,
  manganeseElevated: level,
  manganeseClear: level,
};

const fromBeforeTo = (v: { from?: string; to?: string }) => !v.from || !v.to || v.from <= v.to;
const fromBeforeToIssue = { error: "from must not be after to", path: ["from"] };

export const groupsQuery = z
  .object({
    ...windowShape,
    ...thresholdShape,
    metal: metalParam,
    grouping: choiceOr(GROUPING_KEYS, "fill-source"),
  })
  .refine(fromBeforeTo, fromBeforeToIssue);

export const recurringQuery = z
  .object({
    ...windowShape,
    ...thresholdShape,
    metal: metalParam,
    recurrenceWindowDays: wholeDays(3650),
    chronicAfterDays: wholeDays(3650),
    include: z.preprocess(
      blankAsAbsent,
      z.enum(["findings", "readings"], { error: "must be findings or readings" }).optional(),
    ),
  })
  .refine(fromBeforeTo, fromBeforeToIssue);

export const SERIES_ANALYTES = [
  "copper",
  "iron",
  "manganese",
  "ph",
  "freeChlorine",
  "combinedChlorine",
  "totalAlkalinity",
  "calciumHardness",
  "cyanuricAcid",
  "salt",
  "tds",
  "temperatureC",
  "saturationIndex",
] as const;
export type SeriesAnalyte = (typeof SERIES_ANALYTES)[number];

export const seriesQuery = z
  .object({
    ...windowShape,
    ...thresholdShape,
    analyte: choiceOr(SERIES_ANALYTES, "copper"),
  })
  .refine(fromBeforeTo, fromBeforeToIssue);

export const alertsQuery = z.object({ ...windowShape, ...thresholdShape, metal: metalParam }).refine(fromBeforeTo, fromBeforeToIssue);

export const ARM_DIMENSIONS = ["product", "category", "combination", "category-combination"] as const;

export const outcomesQuery = z
  .object({
    ...windowShape,
    ...thresholdShape,
    metal: choiceOr(METALS, "copper"),
    arm: choiceOr(ARM_DIMENSIONS, "product"),
  })
  .refine(fromBeforeTo, fromBeforeToIssue);

export const summaryQuery = z.object({ ...windowShape, ...thresholdShape }).refine(fromBeforeTo, fromBeforeToIssue);

export const trendQuery = z.object({ ...windowShape, ...thresholdShape, metal: metalParam }).refine(fromBeforeTo, fromBeforeToIssue);

export const evidenceQuery = z.object({ ...windowShape, ...thresholdShape }).refine(fromBeforeTo, fromBeforeToIssue);

/** The four-week metal outlook: a metal and a route narrow the list; the model is the company's own. */
export const outlookQuery = z.object({
  route: positiveId("route"),
  metal: metalParam,
  limit: z.preprocess(
    blankAsAbsent,
    z.coerce
      .number({ error: "must be a whole number" })
      .int({ error: "must be a whole number" })
      .min(1, { error: "must be at least 1" })
      .max(1000, { error: "must be at most 1000" })
      .optional(),
  ),
});

export const sourceHealthQuery = z.object({ ...windowShape, ...thresholdShape, metal: metalParam }).refine(fromBeforeTo, fromBeforeToIssue);

export type ThresholdOverrides = Partial<Record<keyof typeof thresholdShape, number>>;

/** Company thresholds with the request's overrides laid over them. */
export function withOverrides(base: MetalThresholds, overrides: ThresholdOverrides): MetalThresholds {
  const merged: MetalThresholds = {
    copper: { ...base.copper },
    iron: { ...base.iron },
    manganese: { ...base.manganese },
  };
  for (const metal of METALS) {
    const elevated = overrides[`${metal}Elevated`];
    const clear = overrides[`${metal}Clear`];
    if (elevated !== undefined) merged[metal].elevated = elevated;
    if (clear !== undefined) merged[metal].clear = clear;
  }
  return merged;
}

/** The first threshold whose clear level is above its elevated level, as a field problem. */
export function thresholdProblem(thresholds: MetalThresholds): { field: string; message: string } | null {
  for (const metal of METALS) {
    const { elevated, clear } = thresholds[metal];
    if (clear > elevated) {
      return {
        field: `${metal}Clear`,
        message: `${metal}Clear: ${clear} mg/L is above the elevated level ${elevated} mg/L; the clear level must not be above the elevated level`,
      };
    }
  }
  return null;
}

export type ParsedQuery<T> = { ok: true; data: T } | { ok: false; field: string; message: string };

/** Parses a URL's search parameters, naming the field, the value and the problem on failure. */
export function parseQuery<S extends z.ZodType>(searchParams: URLSearchParams, schema: S): ParsedQuery<z.output<S>> {
  const raw: Record<string, string> = {};
  for (const [key, value] of searchParams) raw[key] = value;
  const parsed = schema.safeParse(raw);
  if (parsed.success) return { ok: true, data: parsed.data };
  const issue = parsed.error.issues[0]!;
  const field = String(issue.path[0] ?? "query");
  const value = raw[field];
  const shown = value === undefined ? "" : ` "${value}"`;
  return { ok: false, field, message: `${field}${shown}: ${issue.message}` };
}

/** Builds a query string from defined values, in a stable order (for URLs and query keys). */
export function toSearch(params: Record<string, string | number | null | undefined>): string {
  const search = new URLSearchParams();
  for (const key of Object.keys(params).sort()) {
    const value = params[key];
    if (value !== undefined && value !== null && value !== "") search.set(key, String(value));
  }
  const text = search.toString();
  return text ? `?${text}` : "";
}

