/**
 * The values the database stores for each choice. Client-safe, so forms and
 * the schema read the same lists.
 */
export const UNIT_SYSTEMS = ["us", "metric"] as const;
export type UnitSystem = (typeof UNIT_SYSTEMS)[number];

export const SOURCE_KINDS = ["municipal", "private_well", "shared_well", "trucked", "other"] as const;
export const SURFACES = ["plaster", "pebble", "quartz", "vinyl", "fibreglass", "tile"] as const;
export const SANITISERS = ["chlorine", "salt_generator", "mineral_assist", "other"] as const;
export const EQUIPMENT_KINDS = ["heater", "heat_pump", "salt_cell", "pump", "filter", "ioniser", "other"] as const;
export const EXCHANGER_METALS = ["copper", "cupronickel", "titanium", "none", "unknown"] as const;

export const PRODUCT_CATEGORIES = [
  "sequestrant",
  "collector_pad",
  "ph_decreaser",
  "copper_algaecide",
  "other_algaecide",
  "chlorine",
  "other",
] as const;
export const DOSE_BASES = ["per_10k_gal", "per_10_m3"] as const;

export const HARDNESS_ENDPOINTS = ["clean", "blurred"] as const;
export const STAIN_STATES = ["none", "new", "existing"] as const;
export const STAIN_COLOURS = ["blue_green", "red_brown", "black_brown", "other"] as const;
export const PAD_TINTS = ["none", "tinted", "not_fitted"] as const;
