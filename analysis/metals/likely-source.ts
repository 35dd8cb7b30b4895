import { classifyBalance, DEFAULT_BALANCE_BAND, type BalanceBand } from "../chemistry/saturation";
import type { TreatmentRecord } from "../outcomes/treatments";
import { DAY_MS } from "./episodes";
import { DEFAULT_METAL_THRESHOLDS, metalStatus, type Metal, type MetalReading, type MetalThresholds } from "./reading";
import { heatersAt, isInstalledAt, wholeYearsBetween, type PoolProfile } from "./route-book";
import type { SharedSourceAlert } from "./shared-source";

export interface FillSourceTest {
  fillSourceId: string;
  takenAt: number;
  copper?: MetalReading | null;
  iron?: MetalReading | null;
  manganese?: MetalReading | null;
}

export interface BalancePoint {
  takenAt: number;
  saturationIndex: number;
}

export type EvidenceKind =
  | "fill-water-test"
  | "shared-source-alert"
  | "ageing-copper-exchanger-with-corrosive-water"
  | "copper-algaecide"
  | "ioniser"
  | "iron-with-well-water";

/** One piece of evidence, with the reason shown to the user. Not a verdict. */
export interface Evidence {
  kind: EvidenceKind;
  reason: string;
  at: number | null;
}

export interface EvidenceRules {
  /** Fill-water tests this long before onset (and up to followingDays after) count. */
  fillTestLookbackDays: number;
  fillTestFollowingDays: number;
  /** Shared-source alerts within this many days of onset count. */
  sharedAlertMarginDays: number;
  exchangerMinAgeYears: number;
  corrosiveLookbackDays: number;
  algaecideLookbackDays: number;
  balanceBand: BalanceBand;
}

export const DEFAULT_EVIDENCE_RULES: EvidenceRules = {
  fillTestLookbackDays: 730,
  fillTestFollowingDays: 30,
  sharedAlertMarginDays: 21,
  exchangerMinAgeYears: 10,
  corrosiveLookbackDays: 60,
  algaecideLookbackDays: 180,
  balanceBand: DEFAULT_BALANCE_BAND,
};

export interface EvidenceInput {
  pool: PoolProfile;
  metal: Metal;
  /** Opening of the episode being explained. */
  onsetAt: number;
  fillSourceTests?: readonly FillSourceTest[];
  sharedSourceAlerts?: readonly SharedSourceAlert[];
  balance?: readonly BalancePoint[];
  treatments?: readonly Pick<TreatmentRecord, "poolId" | "category" | "appliedAt" | "productId">[];
  thresholds?: MetalThresholds;
  rules?: Partial<EvidenceRules>;
  formatDate?: (epochMs: number) => string;
}

const isoDate = (epochMs: number) => new Date(epochMs).toISOString().slice(0, 10);
const mgPerLitre = (value: number) => `${Number(value.toFixed(3))} mg/L`;

/**
 * Lists what points at a cause of a pool's metal episode. Each item states
 * its own reason; more than one cause can be at work, so nothing is ranked.
 */
export function likelySourceEvidence(input: EvidenceInput): Evidence[] {
  const rules = { ...DEFAULT_EVIDENCE_RULES, ...input.rules };
  const thresholds = input.thresholds ?? DEFAULT_METAL_THRESHOLDS;
  const levels = thresholds[input.metal];
  const date = input.formatDate ?? isoDate;
  const { pool, metal, onsetAt } = input;
  const evidence: Evidence[] = [];

  if (pool.fillSourceId) {
    const from = onsetAt - rules.fillTestLookbackDays * DAY_MS;
    const to = onsetAt + rules.fillTestFollowingDays * DAY_MS;
    for (const t of input.fillSourceTests ?? []) {
      const reading = t[metal];
      if (t.fillSourceId !== pool.fillSourceId || !reading || t.takenAt < from || t.takenAt > to) continue;
      const status = metalStatus(reading, levels);
      if (status === "elevated" || status === "watch") {
        const level = status === "elevated" ? `at or above the elevated level ${mgPerLitre(levels.elevated)}` : `above the clear level ${mgPerLitre(levels.clear)}`;
        evidence.push({
          kind: "fill-water-test",
          reason: `Fill water tested ${mgPerLitre(reading.value)} ${metal} on ${date(t.takenAt)}, ${level}.`,
          at: t.takenAt,
        });
      }
    }
    const margin = rules.sharedAlertMarginDays * DAY_MS;
    for (const alert of input.sharedSourceAlerts ?? []) {
      if (alert.fillSourceId !== pool.fillSourceId || alert.metal !== metal) continue;
      if (onsetAt < alert.firstOpeningAt - margin || onsetAt > alert.lastOpeningAt + margin) continue;
      evidence.push({
        kind: "shared-source-alert",
        reason: `${alert.poolIds.length} pools on the same fill source opened a ${metal} episode between ${date(alert.firstOpeningAt)} and ${date(alert.lastOpeningAt)}.`,
        at: alert.firstOpeningAt,
      });
    }
  }

  if (metal === "copper") {
    const corrodible = heatersAt(pool, onsetAt).filter(
      (h) => (h.exchangerMetal === "copper" || h.exchangerMetal === "cupronickel") && h.installedAt !== null,
    );
    const oldEnough = corrodible.filter((h) => wholeYearsBetween(h.installedAt!, onsetAt) >= rules.exchangerMinAgeYears);
    if (oldEnough.length > 0) {
      const since = onsetAt - rules.corrosiveLookbackDays * DAY_MS;
      const corrosive = (input.balance ?? []).filter(
        (b) => b.takenAt >= since && b.takenAt <= onsetAt && classifyBalance(b.saturationIndex, rules.balanceBand) === "corrosive",
      );
      if (corrosive.length > 0) {
        const heater = oldEnough[0]!;
        const lowest = corrosive.reduce((min, b) => (b.saturationIndex < min.saturationIndex ? b : min));
        evidence.push({
          kind: "ageing-copper-exchanger-with-corrosive-water",
          reason: `A ${heater.exchangerMetal} heat exchanger ${wholeYearsBetween(heater.installedAt!, onsetAt)} years old was fitted, and ${corrosive.length} test(s) in the ${rules.corrosiveLookbackDays} days before onset showed corrosive water (lowest saturation index ${lowest.saturationIndex.toFixed(2)} on ${date(lowest.takenAt)}).`,
          at: lowest.takenAt,
        });
      }
    }

    const algaecideSince = onsetAt - rules.algaecideLookbackDays * DAY_MS;
    const algaecide = (input.treatments ?? []).filter(
      (t) => t.poolId === pool.poolId && t.category === "copper-algaecide" && t.appliedAt >= algaecideSince && t.appliedAt <= onsetAt,
    );
    if (algaecide.length > 0) {
      const last = algaecide.reduce((a, b) => (b.appliedAt > a.appliedAt ? b : a));
      evidence.push({
        kind: "copper-algaecide",
        reason: `Copper-based algaecide applied ${algaecide.length} time(s) in the ${rules.algaecideLookbackDays} days before onset, last on ${date(last.appliedAt)}.`,
        at: last.appliedAt,
      });
    }

    const ioniser = (pool.equipment ?? []).find((e) => e.kind === "ioniser" && isInstalledAt(e, onsetAt));
    if (ioniser || pool.sanitiser === "mineral-ioniser-assist") {
      evidence.push({
        kind: "ioniser",
        reason: "A mineral ioniser, which releases copper into the water, was in use at onset.",
        at: ioniser?.installedAt ?? null,
      });
    }
  }

  if (metal === "iron" && (pool.fillSourceKind === "private-well" || pool.fillSourceKind === "shared-well")) {
    evidence.push({
      kind: "iron-with-well-water",
      reason: `Iron episode on a pool filled from a ${pool.fillSourceKind === "shared-well" ? "shared" : "private"} well; well water often carries dissolved iron.`,
      at: null,
    });
  }

  return evidence;
}
