import type { Metal } from "@analysis/metals/reading";

export const METAL_LABELS: Record<Metal, string> = { copper: "Copper", iron: "Iron", manganese: "Manganese" };
