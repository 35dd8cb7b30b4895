export type Metal = "copper" | "iron" | "manganese";

export const METALS: readonly Metal[] = ["copper", "iron", "manganese"];

/**
 * A metal reading in mg/L. A "<x" result is kept as value x with
 * belowDetection set, because "<0.05" and "0.05" mean different things.
 */
export interface MetalReading {
  value: number;
  belowDetection: boolean;
}

export interface MetalLevels {
  /** At or above: elevated. */
  elevated: number;
  /** Below: clear. */
  clear: number;
}

export type MetalThresholds = Record<Metal, MetalLevels>;

/**
 * Pool staining levels: common practice of the trade (no published source),
 * not a health limit. Companies override them in their settings.
 */
export const DEFAULT_METAL_THRESHOLDS: MetalThresholds = {
  copper: { elevated: 0.3, clear: 0.1 },
  iron: { elevated: 0.2, clear: 0.1 },
  manganese: { elevated: 0.05, clear: 0.02 },
};

/** Drinking-water limits, shown for context only (US EPA 40 CFR 143.3 and 141.80(c); WHO). */
export const DRINKING_WATER_CONTEXT = {
  secondaryStandard: { copper: 1.0, iron: 0.3, manganese: 0.05 },
  copperActionLevel: 1.3,
  whoCopperGuideline: 2,
} as const;

/** "watch" sits between clear and elevated; "unknown" is a "<x" reading with x above clear. */
export type MetalStatus = "elevated" | "watch" | "clear" | "unknown";

export function metalStatus(reading: MetalReading, levels: MetalLevels): MetalStatus {
  if (reading.belowDetection) {
    // "<x" says only that the true value is below x.
    return reading.value <= levels.clear ? "clear" : "unknown";
  }
  if (reading.value >= levels.elevated) return "elevated";
  if (reading.value < levels.clear) return "clear";
  return "watch";
}

export function validateThresholds(thresholds: MetalThresholds): string[] {
  const problems: string[] = [];
  for (const metal of METALS) {
    const { elevated, clear } = thresholds[metal];
    if (!(clear > 0)) problems.push(`${metal}: clear level must be above 0`);
    if (!(elevated >= clear)) problems.push(`${metal}: elevated level ${elevated} must not be below clear level ${clear}`);
  }
  return problems;
}

export const METAL_INPUT_BOUNDS = { min: 0, max: 10 } as const;

export function formatMetalReading(reading: MetalReading): string {
  return `${reading.belowDetection ? "<" : ""}${reading.value}`;
}
