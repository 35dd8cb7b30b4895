/** Words for the stored enum values, shown in tables and forms. */
export const SOURCE_KIND_LABELS = {
  municipal: "Municipal supply",
  private_well: "Private well",
  shared_well: "Shared well",
  trucked: "Trucked water",
  other: "Other",
} as const;

export const SURFACE_LABELS = {
  plaster: "Plaster",
  pebble: "Pebble",
  quartz: "Quartz",
  vinyl: "Vinyl",
  fibreglass: "Fibreglass",
  tile: "Tile",
} as const;

export const SANITISER_LABELS = {
  chlorine: "Chlorine",
  salt_generator: "Salt chlorine generator",
  mineral_assist: "Mineral / ioniser assist",
  other: "Other",
} as const;

export const EQUIPMENT_KIND_LABELS = {
  heater: "Heater",
  heat_pump: "Heat pump",
  salt_cell: "Salt cell",
  pump: "Pump",
  filter: "Filter",
  ioniser: "Ioniser",
  other: "Other",
} as const;

export const EXCHANGER_METAL_LABELS = {
  copper: "Copper",
  cupronickel: "Cupronickel",
  titanium: "Titanium",
  none: "None",
  unknown: "Unknown",
} as const;

export const PRODUCT_CATEGORY_LABELS = {
  sequestrant: "Sequestrant",
  collector_pad: "Metal-collector pad",
  ph_decreaser: "pH decreaser",
  copper_algaecide: "Copper-based algaecide",
  other_algaecide: "Other algaecide",
  chlorine: "Chlorine",
  other: "Other",
} as const;

export const DOSE_BASIS_LABELS = { per_10k_gal: "per 10,000 gal", per_10_m3: "per 10 m³" } as const;

export const STAIN_LABELS = { none: "None", new: "New", existing: "Existing" } as const;
export const STAIN_COLOUR_LABELS = {
  blue_green: "Blue-green",
  red_brown: "Red-brown",
  black_brown: "Black-brown",
  other: "Other",
} as const;
export const PAD_TINT_LABELS = { none: "No tint", tinted: "Tinted", not_fitted: "Not fitted" } as const;
export const ENDPOINT_LABELS = { clean: "Clean", blurred: "Blurred" } as const;

export function labelOf<T extends Record<string, string>>(labels: T, value: string | null | undefined): string {
  if (!value) return "—";
  return (labels as Record<string, string>)[value] ?? value;
}
