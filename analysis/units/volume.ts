import {
  LITRES_PER_US_GALLON,
  US_GALLONS_PER_CUBIC_FOOT,
  cubicMetresToLitres,
} from "./convert";

export type LengthUnit = "ft" | "m";

/**
 * Depth is given at the shallow and deep ends; a constant slope between them
 * makes the mean depth the right multiplier for every shape below.
 */
export interface PoolDepth {
  shallow: number;
  deep: number;
}

export type PoolShape =
  | { shape: "rectangle"; length: number; width: number; depth: PoolDepth; unit: LengthUnit }
  | { shape: "round"; diameter: number; depth: PoolDepth; unit: LengthUnit }
  /** Length and width across the longest and shortest axes. */
  | { shape: "oval"; length: number; width: number; depth: PoolDepth; unit: LengthUnit }
  /** Widths at the two widest lobes, and overall length. */
  | { shape: "kidney"; length: number; widthA: number; widthB: number; depth: PoolDepth; unit: LengthUnit };

export interface PoolVolume {
  gallons: number;
  litres: number;
  /** Which surface-area formula was used, for the help text beside the figure. */
  method: string;
}

/**
 * Share of the bounding box (length x (widthA + widthB)) that a kidney outline
 * covers. Common practice of the trade (no published source); it lands within a
 * few percent of measured kidney outlines.
 */
export const KIDNEY_AREA_FACTOR = 0.45;

export type VolumeError = { error: "non-positive-dimension"; field: string };

function meanDepth(depth: PoolDepth): number {
  return (depth.shallow + depth.deep) / 2;
}

function surfaceArea(pool: PoolShape): { area: number; method: string } {
  switch (pool.shape) {
    case "rectangle":
      return { area: pool.length * pool.width, method: "length x width x mean depth" };
    case "round":
      return {
        area: Math.PI * (pool.diameter / 2) ** 2,
        method: "pi x radius^2 x mean depth (circle)",
      };
    case "oval":
      // An ellipse; the trade's "x 5.9 gallons per ft3" shortcut is pi/4 x 7.48 rounded.
      return {
        area: (Math.PI / 4) * pool.length * pool.width,
        method: "pi/4 x length x width x mean depth (ellipse)",
      };
    case "kidney":
      return {
        area: KIDNEY_AREA_FACTOR * (pool.widthA + pool.widthB) * pool.length,
        method: "0.45 x (width A + width B) x length x mean depth (common practice, no published source)",
      };
  }
}

function dimensions(pool: PoolShape): Record<string, number> {
  const depth = { shallowDepth: pool.depth.shallow, deepDepth: pool.depth.deep };
  switch (pool.shape) {
    case "rectangle":
      return { length: pool.length, width: pool.width, ...depth };
    case "round":
      return { diameter: pool.diameter, ...depth };
    case "oval":
      return { length: pool.length, width: pool.width, ...depth };
    case "kidney":
      return { length: pool.length, widthA: pool.widthA, widthB: pool.widthB, ...depth };
  }
}

/**
 * Water volume of a pool from its outline and depths. Gallons are US gallons
 * (7.480519... per ft3, exact from 231 in3 per gallon).
 */
export function poolVolume(pool: PoolShape): PoolVolume | VolumeError {
  for (const [field, value] of Object.entries(dimensions(pool))) {
    if (!(value > 0) || !Number.isFinite(value)) return { error: "non-positive-dimension", field };
  }
  const { area, method } = surfaceArea(pool);
  const bulk = area * meanDepth(pool.depth);
  if (pool.unit === "ft") {
    const gallons = bulk * US_GALLONS_PER_CUBIC_FOOT;
    return { gallons, litres: gallons * LITRES_PER_US_GALLON, method };
  }
  const litres = cubicMetresToLitres(bulk);
  return { gallons: litres / LITRES_PER_US_GALLON, litres, method };
}

export function isVolumeError(result: PoolVolume | VolumeError): result is VolumeError {
  return "error" in result;
}

/** A product label states its dose per 10,000 US gallons or per 10 m3 of water. */
export type LabelBasis = "per-10000-gallons" | "per-10-cubic-metres";

export interface LabelRate {
  amount: number;
  unit: string;
  basis: LabelBasis;
}

export interface LabelDose {
  amount: number;
  unit: string;
  /** Always shown with the dose: it is an estimate from the label and the recorded volume. */
  caution: string;
}

export const DOSE_CAUTION =
  "Estimate from the product label and the recorded pool volume. Follow the product label, local codes and licensed practice.";

export function labelDose(rate: LabelRate, volume: { gallons: number } | { litres: number }): LabelDose {
  const litres = "litres" in volume ? volume.litres : volume.gallons * LITRES_PER_US_GALLON;
  const amount =
    rate.basis === "per-10000-gallons"
      ? (rate.amount * (litres / LITRES_PER_US_GALLON)) / 10_000
      : (rate.amount * litres) / cubicMetresToLitres(10);
  return { amount, unit: rate.unit, caution: DOSE_CAUTION };
}

