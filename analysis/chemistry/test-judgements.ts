import { classifyBalance, saturationIndex, type BalanceBand } from "@analysis/chemistry/saturation";
import { METALS, metalStatus, type MetalThresholds } from "@analysis/metals/reading";
import { METAL_LABELS, type StoredMetals } from "../metals/names";
import { DEFAULT_ANALYTE_RANGES, judgeAnalyte, type RangedAnalyte } from "./ranges";

/** The columns of a stored water test that the judgements read. */
export type StoredTest = {
  freeChlorine: number | null;
  combinedChlorine: number | null;
  ph: number | null;
  totalAlkalinity: number | null;
  calciumHardness: number | null;
  cyanuricAcid: number | null;
  salt: number | null;
  tds: number | null;
  temperatureC: number | null;
} & StoredMetals;

/** Factor-table saturation index of a stored test, or null when an input is missing. */
export function testSaturationIndex(test: StoredTest): number | null {
  const result = saturationIndex(test, { form: "factor-table" });
  return result.ok ? result.index : null;
}

export type Judged = { label: string; value: string; expected: string; verdict: string; tone: "ok" | "watch" | "alert" };

const RANGED: Array<{ key: RangedAnalyte; label: string; unit: string; digits: number }> = [
  { key: "freeChlorine", label: "Free chlorine", unit: "mg/L", digits: 1 },
  { key: "combinedChlorine", label: "Combined chlorine", unit: "mg/L", digits: 1 },
  { key: "ph", label: "pH", unit: "", digits: 2 },
  { key: "totalAlkalinity", label: "Total alkalinity", unit: "mg/L", digits: 0 },
  { key: "calciumHardness", label: "Calcium hardness", unit: "mg/L", digits: 0 },
  { key: "cyanuricAcid", label: "Cyanuric acid", unit: "mg/L", digits: 0 },
];

/** Every value of one test set against the company's levels and the public-code ranges. */
export function judgeTest(test: StoredTest, thresholds: MetalThresholds, band: BalanceBand): Judged[] {
  const out: Judged[] = [];
  for (const a of RANGED) {
    const value = test[a.key];
    if (value === null) continue;
    const range = DEFAULT_ANALYTE_RANGES[a.key];
    const verdict = judgeAnalyte(a.key, value);
    out.push({
      label: a.label,
      value: `${value.toFixed(a.digits)} ${a.unit}`.trim(),
      expected: `${range.low}–${range.high} ${a.unit}`.trim(),
      verdict,
      tone: verdict === "in range" ? "ok" : "watch",
    });
  }
  for (const metal of METALS) {
    const value = test[metal];
    if (value === null) continue;
    const belowDetection = test[`${metal}BelowDetection`];
    const status = metalStatus({ value, belowDetection }, thresholds[metal]);
    out.push({
      label: METAL_LABELS[metal],
      value: `${belowDetection ? "<" : ""}${value} mg/L`,
      expected: `clear below ${thresholds[metal].clear}, elevated from ${thresholds[metal].elevated}`,
      verdict: status === "unknown" ? "limit above clear" : status,
      tone: status === "elevated" ? "alert" : status === "clear" ? "ok" : "watch",
    });
  }
  const index = testSaturationIndex(test);
  if (index !== null) {
    const balance = classifyBalance(index, band);
    out.push({
      label: "Saturation index",
      value: index.toFixed(2),
      expected: `${band.low} to +${band.high}`,
      verdict: balance,
      tone: balance === "balanced" ? "ok" : "watch",
    });
  }
  return out;
}
