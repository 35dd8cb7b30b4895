import {
  DEFAULT_BALANCE_BAND,
  classifyBalance,
  saturationIndex,
  type BalanceBand,
  type BalanceClass,
  type BalanceInputs,
  type SaturationForm,
  type SaturationResult,
} from "./chemistry/saturation";
import { DEFAULT_EPISODE_RULES, type MetalTest } from "./metals/episodes";
import { DEFAULT_EVIDENCE_RULES, type EvidenceRules } from "./metals/likely-source";
import { DEFAULT_METAL_THRESHOLDS, METALS, metalStatus, type Metal, type MetalStatus, type MetalThresholds } from "./metals/reading";
import { DEFAULT_SHARED_SOURCE_RULES, type SharedSourceRules } from "./metals/shared-source";
import { DEFAULT_OUTCOME_RULES, type OutcomeRules } from "./outcomes/treatments";
import { DEFAULT_GROUP_RULES, type GroupRules } from "./stats/groups";

/** Every threshold a company can change, in one object for its settings page. */
export interface AnalysisThresholds {
  metals: MetalThresholds;
  balanceBand: BalanceBand;
  saturationForm: SaturationForm;
  correctForCyanuricAcid: boolean;
  episodes: { recurrenceWindowDays: number; chronicAfterDays: number };
  groups: GroupRules;
  sharedSource: SharedSourceRules;
  outcomes: OutcomeRules;
  evidence: EvidenceRules;
}

export const DEFAULT_THRESHOLDS: AnalysisThresholds = {
  metals: DEFAULT_METAL_THRESHOLDS,
  balanceBand: DEFAULT_BALANCE_BAND,
  saturationForm: "factor-table",
  correctForCyanuricAcid: true,
  episodes: { ...DEFAULT_EPISODE_RULES },
  groups: DEFAULT_GROUP_RULES,
  sharedSource: DEFAULT_SHARED_SOURCE_RULES,
  outcomes: DEFAULT_OUTCOME_RULES,
  evidence: DEFAULT_EVIDENCE_RULES,
};

export type ThresholdOverrides = {
  [K in keyof AnalysisThresholds]?: AnalysisThresholds[K] extends object ? Partial<AnalysisThresholds[K]> : AnalysisThresholds[K];
};

/** Company settings over the defaults; each section merges one level deep. */
export function resolveThresholds(overrides: ThresholdOverrides = {}): AnalysisThresholds {
  const merged = { ...DEFAULT_THRESHOLDS } as Record<string, unknown>;
  for (const [key, value] of Object.entries(overrides)) {
    if (value === undefined) continue;
    const base = (DEFAULT_THRESHOLDS as unknown as Record<string, unknown>)[key];
    merged[key] = typeof value === "object" && value !== null && typeof base === "object" ? { ...base, ...value } : value;
  }
  return merged as unknown as AnalysisThresholds;
}

export interface TestAssessment {
  saturation: SaturationResult;
  balance: BalanceClass | null;
  metals: Record<Metal, MetalStatus | "not-tested">;
}

/** Balance and metal status of one test under the company's thresholds. */
export function assessTest(test: BalanceInputs & Partial<Pick<MetalTest, Metal>>, thresholds: AnalysisThresholds = DEFAULT_THRESHOLDS): TestAssessment {
  const saturation = saturationIndex(test, { form: thresholds.saturationForm, correctForCyanuricAcid: thresholds.correctForCyanuricAcid });
  const metals = {} as Record<Metal, MetalStatus | "not-tested">;
  for (const metal of METALS) {
    const reading = test[metal];
    metals[metal] = reading ? metalStatus(reading, thresholds.metals[metal]) : "not-tested";
  }
  return { saturation, balance: saturation.ok ? classifyBalance(saturation.index, thresholds.balanceBand) : null, metals };
}
