// The demo company's product list, with the effect each product has in the
// simulation. Effect sizes are invented but plausible: the heavy-duty
// sequestrant plus a collector pad clears a typical episode in one to two
// weeks, the maintenance sequestrant alone often only dents it.

export type ProductKey =
  | "sequestrantHeavy"
  | "sequestrantMaintenance"
  | "collectorPad"
  | "phDecreaser"
  | "copperAlgaecide"
  | "polyquatAlgaecide"
  | "liquidChlorine";

export type ProductSpec = {
  key: ProductKey;
  name: string;
  category: "sequestrant" | "collector_pad" | "ph_decreaser" | "copper_algaecide" | "other_algaecide" | "chlorine";
  /** Label dose per 10,000 gal, in doseUnit. */
  labelDose: number;
  /** The label's regular dose after the first, where it gives one. */
  maintenanceDose?: number;
  doseUnit: string;
  unitCost: number;
};

export const PRODUCTS: readonly ProductSpec[] = [
  { key: "sequestrantHeavy", name: "House sequestrant, heavy duty", category: "sequestrant", labelDose: 32, maintenanceDose: 8, doseUnit: "fl oz", unitCost: 0.62 },
  { key: "sequestrantMaintenance", name: "House sequestrant, maintenance", category: "sequestrant", labelDose: 16, maintenanceDose: 4, doseUnit: "fl oz", unitCost: 0.29 },
  { key: "collectorPad", name: "Skimmer collector pad", category: "collector_pad", labelDose: 1, doseUnit: "each", unitCost: 24.5 },
  { key: "phDecreaser", name: "Dry acid pH decreaser", category: "ph_decreaser", labelDose: 1.5, doseUnit: "lb", unitCost: 2.15 },
  { key: "copperAlgaecide", name: "Copper algaecide 7%", category: "copper_algaecide", labelDose: 16, doseUnit: "fl oz", unitCost: 0.48 },
  { key: "polyquatAlgaecide", name: "Polyquat algaecide", category: "other_algaecide", labelDose: 12, doseUnit: "fl oz", unitCost: 0.36 },
  { key: "liquidChlorine", name: "Liquid chlorine 12.5%", category: "chlorine", labelDose: 1, doseUnit: "gal", unitCost: 5.8 },
];

/** How a sequestrant acts on measured metal while it lasts. */
export const SEQUESTRANT_EFFECT: Partial<Record<ProductKey, { removalPerDay: number; halfLifeDays: number }>> = {
  sequestrantHeavy: { removalPerDay: 0.1, halfLifeDays: 21 },
  sequestrantMaintenance: { removalPerDay: 0.03, halfLifeDays: 12 },
};

/** A fresh pad's removal rate; it loads and loses grip with a half-life of about three weeks. */
export const COLLECTOR_PAD_EFFECT = { removalPerDay: 0.11, halfLifeDays: 20 };

/** Copper added by one label dose of the copper algaecide, mg/L. */
export const COPPER_PER_ALGAECIDE_DOSE = 0.2;
