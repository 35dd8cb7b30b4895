import { saturationIndex, type SaturationResult } from "@analysis/chemistry/saturation";
import { metalStatus, type MetalThresholds } from "@analysis/metals/reading";
import { parseDecimal } from "@analysis/units/decimal";
import { labelAmountForPool, sequestrantPhNote, type PoolLabelAmount, type StoredDoseBasis } from "@analysis/units/label-dose";
import type { FieldErrors } from "./fields";
import { DEFAULT_ANALYTE_RANGES } from "@analysis/chemistry/ranges";
import { hasMetalReading, parseVisitReadings, PH_WARNING, type VisitReadings, VISIT_METALS } from "./visit";

/**
 * What the visit form shows while the technician types: the saturation index,
 * the warnings, the request for a metal test, the acid caution and each
 * treatment's cost. Pure functions of the typed form, so the browser and the
 * tests compute the same thing.
 */

export type LiveProduct = {
  id: number;
  category: string;
  doseUnit: string | null;
  unitCost: number | null;
  labelDose?: number | null;
  maintenanceDose?: number | null;
  doseBasis?: StoredDoseBasis;
};
/** The pool the visit is for, as far as dosing goes. */
export type DosingPool = { volumeLitres: number | null; units: "us" | "metric" };
export type TypedLine = { productId: string; amount: string; unit: string };

export function visitBalance(readings: VisitReadings): SaturationResult {
  return saturationIndex({
    ph: readings.ph,
    temperatureC: readings.temperatureC,
    calciumHardness: readings.calciumHardness,
    totalAlkalinity: readings.totalAlkalinity,
    cyanuricAcid: readings.cyanuricAcid,
    tds: readings.tds,
    salt: readings.salt,
  });
}

/** Readings worth a second look; the visit can still be saved. */
export function visitWarnings(readings: VisitReadings, thresholds: MetalThresholds): string[] {
  const warnings: string[] = [];
  if (readings.ph !== undefined && (readings.ph < PH_WARNING.low || readings.ph > PH_WARNING.high)) {
    warnings.push(`pH ${readings.ph} is outside ${PH_WARNING.low}–${PH_WARNING.high}: check the reading and the reagent.`);
  }
  for (const metal of VISIT_METALS) {
    const reading = readings[metal.key];
    if (reading && metalStatus(reading, thresholds[metal.key]) === "elevated") {
      warnings.push(`${metal.label} ${reading.value} mg/L is at or above the elevated level (${thresholds[metal.key].elevated} mg/L).`);
    }
  }
  return warnings;
}

/** A blurred hardness endpoint with no metal reading yet: ask for copper, iron and manganese. */
export function asksForMetalTest(hardnessEndpoint: string | undefined, readings: VisitReadings): boolean {
  return hardnessEndpoint === "blurred" && !hasMetalReading(readings);
}

/** The cost of a treatment line, when its product has a cost per dose unit and the line is in that unit. */
export function treatmentCost(line: TypedLine, product: LiveProduct | undefined): number | null {
  const amount = parseDecimal(line.amount, { decimalComma: true }) ?? 0;
  if (product?.unitCost == null || !product.doseUnit || amount <= 0) return null;
  return line.unit.toLowerCase() === product.doseUnit.toLowerCase() ? amount * product.unitCost : null;
}

export type LiveVisit = {
  readings: VisitReadings;
  /** Problems found in the typed readings, by field. */
  errors: FieldErrors;
  balance: SaturationResult;
  warnings: string[];
  askForMetals: boolean;
  /** A pH decreaser is among the treatments. */
  acidGiven: boolean;
  /** pH above the default range's top, where a pH decreaser is the usual step. */
  phHigh: boolean;
  hasStain: boolean;
  /** One per treatment line, null when it cannot be costed. */
  costs: Array<number | null>;
  /** One per treatment line: the label's amount for this pool, null with no product chosen. */
  labelAmounts: Array<PoolLabelAmount | null>;
  /** A sequestrant is among the treatments and the pH typed is outside where it is usually dosed. */
  sequestrantNote: string | null;
};

/** The label's amount for the pool, for the product a line names (shown, never filled in). */
export function lineLabelAmount(product: LiveProduct | undefined, pool: DosingPool): PoolLabelAmount | null {
  if (!product) return null;
  return labelAmountForPool(
    {
      labelDose: product.labelDose ?? null,
      maintenanceDose: product.maintenanceDose ?? null,
      doseUnit: product.doseUnit,
      doseBasis: product.doseBasis ?? "per_10k_gal",
    },
    pool.volumeLitres,
    pool.units,
  );
}

export function liveVisit(
  values: Record<string, string>,
  lines: readonly TypedLine[],
  products: readonly LiveProduct[],
  thresholds: MetalThresholds,
  pool: DosingPool = { volumeLitres: null, units: "us" },
): LiveVisit {
  const { readings, errors } = parseVisitReadings(values);
  const productById = new Map(products.map((p) => [String(p.id), p]));
  return {
    readings,
    errors,
    balance: visitBalance(readings),
    warnings: visitWarnings(readings, thresholds),
    askForMetals: asksForMetalTest(values.hardnessEndpoint, readings),
    acidGiven: lines.some((l) => productById.get(l.productId)?.category === "ph_decreaser"),
    phHigh: readings.ph !== undefined && readings.ph > DEFAULT_ANALYTE_RANGES.ph.high,
    hasStain: values.stain === "new" || values.stain === "existing",
    costs: lines.map((line) => treatmentCost(line, productById.get(line.productId))),
    labelAmounts: lines.map((line) => lineLabelAmount(productById.get(line.productId), pool)),
    sequestrantNote: lines.some((l) => productById.get(l.productId)?.category === "sequestrant") ? sequestrantPhNote(readings.ph) : null,
  };
}
