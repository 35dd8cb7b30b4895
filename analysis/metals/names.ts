import type { Metal } from "@analysis/metals/reading";

export const METAL_LABELS: Record<Metal, string> = { copper: "Copper", iron: "Iron", manganese: "Manganese" };

/** The stored metal columns of a test (pool or fill water): each value in mg/L with its below-detection flag. */
export type StoredMetals = {
  copper: number | null;
  copperBelowDetection: boolean;
  iron: number | null;
  ironBelowDetection: boolean;
  manganese: number | null;
  manganeseBelowDetection: boolean;
};
