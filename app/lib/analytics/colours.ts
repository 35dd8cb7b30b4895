import type { Metal } from "@analysis/metals/reading";

/**
 * Patina's metal colours and shapes: an orange, a blue and a purple that stay
 * apart for the common colour-vision deficiencies, each paired with its own
 * symbol so no chart relies on colour alone.
 */
export const METAL_COLOURS: Record<Metal, string> = { copper: "#b3541e", iron: "#2f6fa7", manganese: "#6b4c9a" };
export const METAL_SYMBOLS: Record<Metal, "circle" | "square" | "triangle"> = { copper: "circle", iron: "square", manganese: "triangle" };

export const BALANCE_COLOURS = { corrosive: "#b3541e", balanced: "#3d8b7a", "scale-forming": "#6b4c9a" } as const;

/** Flags in group charts: risky, ordinary, too small to judge. */
export const FLAG_COLOURS = { risky: "#b3541e", ordinary: "#22604f", small: "#9aa5a5" } as const;

/** Up to eight arms of a comparison, distinguishable without colour too (dash patterns in the chart). */
export const ARM_COLOURS = ["#22604f", "#b3541e", "#2f6fa7", "#6b4c9a", "#c99a06", "#5b6b6b", "#8c3b5e", "#3d8b7a"] as const;
