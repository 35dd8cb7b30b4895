import { celsiusToFahrenheit } from "../units/convert";

/** Inputs of one water test that bear on water balance; canonical units. */
export interface BalanceInputs {
  ph?: number | null;
  temperatureC?: number | null;
  /** mg/L as CaCO3 */
  calciumHardness?: number | null;
  /** mg/L as CaCO3 */
  totalAlkalinity?: number | null;
  /** mg/L */
  cyanuricAcid?: number | null;
  /** mg/L */
  tds?: number | null;
  /** mg/L; a lower bound for TDS when TDS itself was not measured. */
  salt?: number | null;
}

export type BalanceField = "ph" | "temperatureC" | "calciumHardness" | "totalAlkalinity" | "tds";

export type SaturationForm = "factor-table" | "continuous";

export type SaturationResult =
  | {
      ok: true;
      form: SaturationForm;
      index: number;
      /** Alkalinity actually used, after any cyanuric acid correction. */
      carbonateAlkalinity: number;
      notes: string[];
    }
  | { ok: false; form: SaturationForm; missing: BalanceField[]; reason: string };

// ---------------------------------------------------------------------------
// Cyanuric acid correction

/** CaCO3 equivalent weight over cyanuric acid's molar mass: 50.043 / 129.07. */
export const CYANURATE_ALKALINITY_RATIO = 50.043 / 129.07;

/** First dissociation constant of cyanuric acid at pool temperatures. */
export const CYANURIC_ACID_PKA = 6.83;

/**
 * Fraction of cyanuric acid (mg/L) that shows up as alkalinity (mg/L as CaCO3)
 * at a given pH: only the dissociated cyanurate ion takes up acid in the
 * alkalinity titration.
 */
export function cyanurateAlkalinityFactor(ph: number): number {
  return CYANURATE_ALKALINITY_RATIO / (1 + 10 ** (CYANURIC_ACID_PKA - ph));
}

/** Total alkalinity minus the part contributed by cyanurate. */
export function carbonateAlkalinity(totalAlkalinity: number, cyanuricAcid: number, ph: number): number {
  return totalAlkalinity - cyanuricAcid * cyanurateAlkalinityFactor(ph);
}

// ---------------------------------------------------------------------------
// Continuous form: LSI = pH - pHs, pHs = (9.3 + A + B) - (C + D)

export function saturationPh(tds: number, temperatureC: number, calciumHardness: number, alkalinity: number): number {
  const a = (Math.log10(tds) - 1) / 10;
  const b = -13.12 * Math.log10(temperatureC + 273) + 34.55;
  const c = Math.log10(calciumHardness) - 0.4;
  const d = Math.log10(alkalinity);
  return 9.3 + a + b - (c + d);
}

export function continuousSaturationIndex(
  ph: number,
  tds: number,
  temperatureC: number,
  calciumHardness: number,
  alkalinity: number,
): number {
  return ph - saturationPh(tds, temperatureC, calciumHardness, alkalinity);
}

// ---------------------------------------------------------------------------
// Factor-table form used by public pool codes: SI = pH + TF + CF + AF - K

type FactorRow = readonly [input: number, factor: number];

export const TEMPERATURE_FACTORS_F: readonly FactorRow[] = [
  [32, 0.0], [37, 0.1], [46, 0.2], [53, 0.3], [60, 0.4], [66, 0.5],
  [76, 0.6], [84, 0.7], [94, 0.8], [105, 0.9], [128, 1.0],
];

export const CALCIUM_FACTORS: readonly FactorRow[] = [
  [5, 0.3], [25, 1.0], [50, 1.3], [75, 1.5], [100, 1.6], [150, 1.8],
  [200, 1.9], [300, 2.1], [400, 2.2], [800, 2.5], [1000, 2.6],
];

export const ALKALINITY_FACTORS: readonly FactorRow[] = [
  [5, 0.7], [25, 1.4], [50, 1.7], [75, 1.9], [100, 2.0], [150, 2.2],
  [200, 2.3], [300, 2.5], [400, 2.6], [800, 2.9], [1000, 3.0],
];

export const FACTOR_CONSTANT = 12.1;
export const FACTOR_CONSTANT_HIGH_TDS = 12.2;
export const HIGH_TDS_MG_PER_L = 1000;

/**
 * Linear interpolation between table rows. Outside the table the end row is
 * used: the codes give no rows beyond it and extrapolating a rounded table is
 * worse than holding its last value.
 */
export function interpolateFactor(table: readonly FactorRow[], input: number): { factor: number; clamped: boolean } {
  const first = table[0];
  const last = table[table.length - 1];
  if (!first || !last) throw new Error("empty factor table");
  if (input <= first[0]) return { factor: first[1], clamped: input < first[0] };
  if (input >= last[0]) return { factor: last[1], clamped: input > last[0] };
  for (let i = 1; i < table.length; i++) {
    const upper = table[i]!;
    if (input <= upper[0]) {
      const lower = table[i - 1]!;
      const t = (input - lower[0]) / (upper[0] - lower[0]);
      return { factor: lower[1] + t * (upper[1] - lower[1]), clamped: false };
    }
  }
  return { factor: last[1], clamped: false };
}

export interface FactorBreakdown {
  temperatureFactor: number;
  calciumFactor: number;
  alkalinityFactor: number;
  constant: number;
  clampedInputs: Array<"temperature" | "calciumHardness" | "alkalinity">;
}

export function saturationFactors(
  temperatureC: number,
  calciumHardness: number,
  alkalinity: number,
  tds: number | null,
): FactorBreakdown {
  const temperature = interpolateFactor(TEMPERATURE_FACTORS_F, celsiusToFahrenheit(temperatureC));
  const calcium = interpolateFactor(CALCIUM_FACTORS, calciumHardness);
  const alk = interpolateFactor(ALKALINITY_FACTORS, alkalinity);
  const clampedInputs: FactorBreakdown["clampedInputs"] = [];
  if (temperature.clamped) clampedInputs.push("temperature");
  if (calcium.clamped) clampedInputs.push("calciumHardness");
  if (alk.clamped) clampedInputs.push("alkalinity");
  return {
    temperatureFactor: temperature.factor,
    calciumFactor: calcium.factor,
    alkalinityFactor: alk.factor,
    constant: tds !== null && tds > HIGH_TDS_MG_PER_L ? FACTOR_CONSTANT_HIGH_TDS : FACTOR_CONSTANT,
    clampedInputs,
  };
}

export function factorTableSaturationIndex(
  ph: number,
  temperatureC: number,
  calciumHardness: number,
  alkalinity: number,
  tds: number | null = null,
): number {
  const f = saturationFactors(temperatureC, calciumHardness, alkalinity, tds);
  return ph + f.temperatureFactor + f.calciumFactor + f.alkalinityFactor - f.constant;
}

// ---------------------------------------------------------------------------
// Per-test entry point

export interface SaturationOptions {
  form?: SaturationForm;
  /** Subtract cyanurate's share from total alkalinity before use. */
  correctForCyanuricAcid?: boolean;
}

const present = (v: number | null | undefined): v is number => typeof v === "number" && Number.isFinite(v);

/**
 * Saturation index of one test. Missing inputs give a reason rather than a
 * guessed number: a balance figure built on an assumed temperature or hardness
 * would be shown to customers as if measured.
 */
export function saturationIndex(test: BalanceInputs, options: SaturationOptions = {}): SaturationResult {
  const form = options.form ?? "factor-table";
  const correct = options.correctForCyanuricAcid ?? true;
  const { ph, temperatureC, calciumHardness, totalAlkalinity } = test;
  const measuredTds = present(test.tds) ? test.tds : null;
  const tdsLowerBound = measuredTds ?? (present(test.salt) ? test.salt : null);

  const missing: BalanceField[] = [];
  if (!present(ph)) missing.push("ph");
  if (!present(temperatureC)) missing.push("temperatureC");
  if (!present(calciumHardness)) missing.push("calciumHardness");
  if (!present(totalAlkalinity)) missing.push("totalAlkalinity");
  if (form === "continuous" && tdsLowerBound === null) missing.push("tds");
  if (missing.length > 0 || !present(ph) || !present(temperatureC) || !present(calciumHardness) || !present(totalAlkalinity)) {
    return { ok: false, form, missing, reason: `missing ${missing.join(", ")}` };
  }

  const notes: string[] = [];
  let alkalinity = totalAlkalinity;
  if (correct && present(test.cyanuricAcid) && test.cyanuricAcid > 0) {
    alkalinity = carbonateAlkalinity(totalAlkalinity, test.cyanuricAcid, ph);
    notes.push("alkalinity corrected for cyanuric acid");
  }
  if (!(alkalinity > 0)) {
    return { ok: false, form, missing: [], reason: "carbonate alkalinity is not positive after the cyanuric acid correction" };
  }
  if (!(calciumHardness > 0)) {
    return { ok: false, form, missing: [], reason: "calcium hardness must be above zero" };
  }
  if (measuredTds === null && tdsLowerBound !== null) notes.push("salt reading used as TDS");

  if (form === "continuous") {
    const tds = tdsLowerBound!;
    return {
      ok: true,
      form,
      index: continuousSaturationIndex(ph, tds, temperatureC, calciumHardness, alkalinity),
      carbonateAlkalinity: alkalinity,
      notes,
    };
  }
  const factors = saturationFactors(temperatureC, calciumHardness, alkalinity, tdsLowerBound);
  for (const input of factors.clampedInputs) notes.push(`${input} outside the factor table; end row used`);
  if (tdsLowerBound === null) notes.push("TDS unknown; constant 12.1 used");
  return {
    ok: true,
    form,
    index: ph + factors.temperatureFactor + factors.calciumFactor + factors.alkalinityFactor - factors.constant,
    carbonateAlkalinity: alkalinity,
    notes,
  };
}

// ---------------------------------------------------------------------------
// Classification

export type BalanceClass = "corrosive" | "balanced" | "scale-forming";

export interface BalanceBand {
  low: number;
  high: number;
}

/** Common practice of the trade (no published source). */
export const DEFAULT_BALANCE_BAND: BalanceBand = { low: -0.3, high: 0.3 };

export function classifyBalance(index: number, band: BalanceBand = DEFAULT_BALANCE_BAND): BalanceClass {
  if (index < band.low) return "corrosive";
  if (index > band.high) return "scale-forming";
  return "balanced";
}
