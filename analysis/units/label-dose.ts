import { LITRES_PER_US_GALLON, KILOGRAMS_PER_POUND } from "./convert";
import { labelDose, type LabelBasis } from "./volume";

/**
 * The label dose of a product scaled to one pool, for the visit form: shown
 * beside the amount field, never typed into it. Exact unit definitions from
 * NIST Handbook 44, appendix C (and the UK Weights and Measures Act 1985 for
 * the imperial gallon).
 */

/** 1 imperial gallon = 4.546 09 L exactly. */
export const LITRES_PER_IMPERIAL_GALLON = 4.54609;
/** 1 US fluid ounce = 1/128 US gallon = 29.573 529 562 5 mL exactly. */
export const MILLILITRES_PER_US_FLUID_OUNCE = (LITRES_PER_US_GALLON * 1000) / 128;
/** 1 avoirdupois ounce = 1/16 lb = 28.349 523 125 g exactly. */
export const GRAMS_PER_OUNCE = (KILOGRAMS_PER_POUND * 1000) / 16;

export type WaterVolumeUnit = "us-gal" | "imp-gal" | "L" | "m3";

const LITRES_PER: Record<WaterVolumeUnit, number> = {
  "us-gal": LITRES_PER_US_GALLON,
  "imp-gal": LITRES_PER_IMPERIAL_GALLON,
  L: 1,
  m3: 1000,
};

export function waterVolumeToLitres(amount: number, unit: WaterVolumeUnit): number {
  return amount * LITRES_PER[unit];
}

export function litresToWaterVolume(litres: number, unit: WaterVolumeUnit): number {
  return litres / LITRES_PER[unit];
}

/** Product amounts Patina can restate in the other unit system; anything else (pads, tablets) stays as labelled. */
type ProductUnit = { name: string; kind: "volume" | "mass"; base: number; system: "us" | "metric" };

// base: millilitres for volume, grams for mass.
const PRODUCT_UNITS: Record<string, ProductUnit> = {
  "fl oz": { name: "fl oz", kind: "volume", base: MILLILITRES_PER_US_FLUID_OUNCE, system: "us" },
  qt: { name: "qt", kind: "volume", base: (LITRES_PER_US_GALLON * 1000) / 4, system: "us" },
  gal: { name: "gal", kind: "volume", base: LITRES_PER_US_GALLON * 1000, system: "us" },
  mL: { name: "mL", kind: "volume", base: 1, system: "metric" },
  L: { name: "L", kind: "volume", base: 1000, system: "metric" },
  oz: { name: "oz", kind: "mass", base: GRAMS_PER_OUNCE, system: "us" },
  lb: { name: "lb", kind: "mass", base: KILOGRAMS_PER_POUND * 1000, system: "us" },
  g: { name: "g", kind: "mass", base: 1, system: "metric" },
  kg: { name: "kg", kind: "mass", base: 1000, system: "metric" },
};

const SPELLINGS: Record<string, string> = {
  floz: "fl oz", "fl. oz": "fl oz", "fl.oz": "fl oz", "fluid ounce": "fl oz", "fluid ounces": "fl oz",
  quart: "qt", quarts: "qt", gallon: "gal", gallons: "gal", "us gal": "gal",
  ml: "mL", millilitre: "mL", millilitres: "mL", milliliter: "mL", milliliters: "mL",
  l: "L", litre: "L", litres: "L", liter: "L", liters: "L",
  ounce: "oz", ounces: "oz", lbs: "lb", pound: "lb", pounds: "lb",
  gram: "g", grams: "g", kilogram: "kg", kilograms: "kg",
};

/** The unit a product's dose unit names, when Patina knows it ("fl oz", "lbs", "Litres" …). */
export function productUnit(text: string | null | undefined): ProductUnit | null {
  if (!text) return null;
  const trimmed = text.trim().replace(/\s+/g, " ");
  const known = PRODUCT_UNITS[trimmed] ?? PRODUCT_UNITS[SPELLINGS[trimmed.toLowerCase()] ?? trimmed.toLowerCase()];
  return known ?? null;
}

/** An amount in a known product unit, restated in another unit of the same kind. */
export function convertProductAmount(amount: number, from: string, to: string): number | null {
  const a = productUnit(from);
  const b = productUnit(to);
  if (!a || !b || a.kind !== b.kind) return null;
  return (amount * a.base) / b.base;
}

/** An amount restated in `system`'s everyday unit for its size (40 fl oz as 1.18 L, 12 oz as 340 g); null when already in it or unknown. */
export function equivalentIn(amount: number, unit: string, system: "us" | "metric"): { amount: number; unit: string } | null {
  const known = productUnit(unit);
  if (!known || known.system === system) return null;
  const base = amount * known.base;
  const candidates =
    known.kind === "volume"
      ? system === "metric" ? ["mL", "L"] : ["fl oz", "gal"]
      : system === "metric" ? ["g", "kg"] : ["oz", "lb"];
  const [small, large] = candidates.map((name) => PRODUCT_UNITS[name]!) as [ProductUnit, ProductUnit];
  const target = base >= large.base ? large : small;
  return { amount: base / target.base, unit: target.name };
}

export type StoredDoseBasis = "per_10k_gal" | "per_10_m3";

export type ProductLabel = {
  /** The label's starting (first) dose, in doseUnit per basis. */
  labelDose: number | null;
  /** The label's maintenance dose, in doseUnit per basis. */
  maintenanceDose: number | null;
  doseUnit: string | null;
  doseBasis: StoredDoseBasis;
};

export type PoolLabelAmount =
  | { kind: "no-label" }
  | { kind: "volume-unknown" }
  | {
      kind: "amounts";
      unit: string;
      start: number | null;
      maintenance: number | null;
      /** The same amounts in the company's unit system, when the label uses the other one (and a known unit). */
      startEquivalent: { amount: number; unit: string } | null;
      maintenanceEquivalent: { amount: number; unit: string } | null;
    };

const BASIS: Record<StoredDoseBasis, LabelBasis> = { per_10k_gal: "per-10000-gallons", per_10_m3: "per-10-cubic-metres" };

/**
 * What the label asks for in this pool: each label dose times the pool's
 * recorded volume over the label's basis volume, in the product's own unit.
 * Nothing without a label dose; no figure without a recorded volume.
 */
export function labelAmountForPool(product: ProductLabel, volumeLitres: number | null, system: "us" | "metric"): PoolLabelAmount {
  if (!product.doseUnit || (product.labelDose === null && product.maintenanceDose === null)) return { kind: "no-label" };
  if (volumeLitres === null || !(volumeLitres > 0)) return { kind: "volume-unknown" };
  const unit = product.doseUnit;
  const scaled = (dose: number | null) =>
    dose === null ? null : labelDose({ amount: dose, unit, basis: BASIS[product.doseBasis] }, { litres: volumeLitres }).amount;
  const start = scaled(product.labelDose);
  const maintenance = scaled(product.maintenanceDose);
  return {
    kind: "amounts",
    unit,
    start,
    maintenance,
    startEquivalent: start === null ? null : equivalentIn(start, unit, system),
    maintenanceEquivalent: maintenance === null ? null : equivalentIn(maintenance, unit, system),
  };
}

/** Where sequestrants are usually dosed (common practice of the trade; the product label rules). */
export const SEQUESTRANT_PH_RANGE = { low: 7.2, high: 7.6 } as const;

export function sequestrantPhNote(ph: number | undefined): string | null {
  if (ph === undefined) return null;
  const { low, high } = SEQUESTRANT_PH_RANGE;
  if (ph >= low && ph <= high) return null;
  return `pH ${ph} is outside ${low}–${high}, where sequestrants are usually dosed (common practice); the product label rules.`;
}
