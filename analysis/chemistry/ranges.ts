export type RangedAnalyte =
  | "freeChlorine"
  | "combinedChlorine"
  | "ph"
  | "totalAlkalinity"
  | "calciumHardness"
  | "cyanuricAcid";

export type AnalyteRange = { low: number; high: number; source: string };

/**
 * Default acceptable ranges, taken from public pool codes (shared reference,
 * section 3). They are written for public pools; residential practice is
 * usually a little looser, which is why they are only defaults.
 */
export const DEFAULT_ANALYTE_RANGES: Record<RangedAnalyte, AnalyteRange> = {
  // Low end: CDC operator guidance (1 ppm); high end: Montana ARM 37.115.1308 maximum (8).
  freeChlorine: { low: 1, high: 8, source: "CDC operator guidance; Montana pool rules maximum" },
  combinedChlorine: { low: 0, high: 0.5, source: "Montana pool rules" },
  ph: { low: 7.2, high: 7.8, source: "Montana pool rules" },
  totalAlkalinity: { low: 60, high: 180, source: "ANSI/APSP/ICC-11 2019" },
  calciumHardness: { low: 150, high: 1000, source: "ANSI/APSP/ICC-11 2019" },
  cyanuricAcid: { low: 0, high: 100, source: "Montana pool rules" },
};

export type Judgement = "low" | "in range" | "high";

export function judgeAnalyte(analyte: RangedAnalyte, value: number, ranges = DEFAULT_ANALYTE_RANGES): Judgement {
  const range = ranges[analyte];
  if (value < range.low) return "low";
  if (value > range.high) return "high";
  return "in range";
}

