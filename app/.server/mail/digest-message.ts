import type { Metal } from "@analysis/metals/reading";
import type { RateRatio } from "@analysis/stats/intervals";
import type { AnswerSource } from "../analytics/kept/read-kept";
import { formatDate } from "~/lib/format";
import { METAL_LABELS } from "@analysis/metals/names";
import { absoluteUrl, renderMail, type RenderedMail } from "./templates";

type PoolName = { customerName: string; street: string };

export type WeeklyDigest = {
  /** Whether the episodes and observed time came from the kept rows or were worked out from the tests. */
  source: AnswerSource;
  companyName: string;
  timeZone: string;
  weekStart: number;
  weekEnd: number;
  openCases: Array<{ pool: PoolName; metal: Metal; openedAt: number; daysOpen: number; peak: number }>;
  newRecurring: Array<{ pool: PoolName; metal: Metal; openedAt: number; previousOpenedAt: number }>;
  riskyGroups: Array<{ grouping: string; group: string; pools: number; openings: number; perPoolYear: number; rateRatio: RateRatio }>;
  treatmentResults: Array<{
    pool: PoolName;
    treatment: string;
    metal: Metal;
    startedAt: number;
    baseline: number;
    followUp: { value: number; belowDetection: boolean; daysAfter: number } | null;
    percentReduction: number | null;
    clearedAt: number | null;
  }>;
};

const mgL = (value: number, belowDetection = false) => `${belowDetection ? "<" : ""}${value.toFixed(2)}`;
const poolName = (p: PoolName) => `${p.street} (${p.customerName})`;
const ratio = (value: number) => (Number.isFinite(value) ? value.toFixed(1) : "no episodes elsewhere");

export function digestMail(
  digest: WeeklyDigest,
  options: { baseUrl: string; recipientName: string; unsubscribeToken: string; week: string },
): RenderedMail {
  const day = (at: number) => formatDate(new Date(at), digest.timeZone);
  const period = `${day(digest.weekStart)} to ${day(digest.weekEnd)}`;
  const unsubscribe = absoluteUrl(options.baseUrl, `/unsubscribe/${options.unsubscribeToken}`);
  const summary = `${digest.openCases.length} open metal episode${digest.openCases.length === 1 ? "" : "s"}, ${digest.newRecurring.length} newly recurring pool${digest.newRecurring.length === 1 ? "" : "s"}, ${digest.treatmentResults.length} treatment result${digest.treatmentResults.length === 1 ? "" : "s"}.`;
  return renderMail({
    subject: `${digest.companyName}: your week in metals (${period})`,
    preview: summary,
    blocks: [
      { kind: "paragraph", text: `Hello ${options.recipientName}, here is ${digest.companyName}'s week, ${period}. ${summary}` },
      { kind: "heading", text: "Open metal episodes" },
      {
        kind: "table",
        caption: "Pools with a metal episode still open today; highest reading in mg/L",
        columns: [{ label: "Pool" }, { label: "Metal" }, { label: "Opened" }, { label: "Days open", align: "right" }, { label: "Highest mg/L", align: "right" }],
        rows: digest.openCases.map((c) => [poolName(c.pool), METAL_LABELS[c.metal], day(c.openedAt), String(c.daysOpen), mgL(c.peak)]),
        empty: "No metal episode is open: every pool's last metal reading is clear.",
      },
      { kind: "heading", text: "Pools that became recurring this week" },
      {
        kind: "table",
        caption: "A second episode of the same metal within 365 days of the previous one",
        columns: [{ label: "Pool" }, { label: "Metal" }, { label: "This episode" }, { label: "Previous episode" }],
        rows: digest.newRecurring.map((r) => [poolName(r.pool), METAL_LABELS[r.metal], day(r.openedAt), day(r.previousOpenedAt)]),
        empty: "No pool became recurring this week.",
      },
      { kind: "heading", text: "Groups with more metal episodes than the rest" },
      {
        kind: "table",
        caption: "Groups of at least 3 pools whose episode rate is above the rest of the route book even at the low end of its 95% interval",
        columns: [
          { label: "Grouped by" },
          { label: "Group" },
          { label: "Pools", align: "right" },
          { label: "Episodes", align: "right" },
          { label: "Episodes per pool-year", align: "right" },
          { label: "Times the rest (95% interval)", align: "right" },
        ],
        rows: digest.riskyGroups.map((g) => [
          g.grouping,
          g.group,
          String(g.pools),
          String(g.openings),
          g.perPoolYear.toFixed(2),
          `${ratio(g.rateRatio.estimate)} (${ratio(g.rateRatio.lower)} to ${ratio(g.rateRatio.upper)})`,
        ]),
        empty: "No group of pools stands out from the rest of the route book.",
      },
      { kind: "heading", text: "Treatment results this week" },
      {
        kind: "table",
        caption: "Metal treatments whose follow-up test (3 to 10 days later) or clearing came this week; readings in mg/L",
        columns: [
          { label: "Pool" },
          { label: "Treatment" },
          { label: "Metal" },
          { label: "Before", align: "right" },
          { label: "Follow-up", align: "right" },
          { label: "Change", align: "right" },
          { label: "Cleared" },
        ],
        rows: digest.treatmentResults.map((t) => [
          poolName(t.pool),
          t.treatment,
          METAL_LABELS[t.metal],
          mgL(t.baseline),
          t.followUp ? `${mgL(t.followUp.value, t.followUp.belowDetection)} after ${Math.round(t.followUp.daysAfter)} d` : "none yet",
          t.percentReduction === null ? "—" : `${t.percentReduction >= 0 ? "-" : "+"}${Math.abs(Math.round(t.percentReduction))}%`,
          t.clearedAt === null ? "not yet" : day(t.clearedAt),
        ]),
        empty: "No treatment had its follow-up this week.",
      },
      { kind: "button", href: absoluteUrl(options.baseUrl, "/"), label: "Open Patina" },
      { kind: "cautions" },
    ],
    footer: [
      `The weekly digest of ${digest.companyName} (${options.week}), for owners and managers.`,
      ["Stop receiving the weekly digest", unsubscribe],
    ],
  });
}
