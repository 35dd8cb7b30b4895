import type { GroupingKey } from "@analysis/stats/groups";

/** Words for the grouping dimensions, as the risk page offers them. */
export const GROUPING_LABELS: Record<GroupingKey, string> = {
  "fill-source": "Fill source",
  "fill-source-kind": "Kind of fill source",
  "heater-age": "Heater age at the test",
  "exchanger-metal": "Heat-exchanger metal",
  neighbourhood: "Neighbourhood",
  route: "Route",
  surface: "Surface finish",
  sanitiser: "Sanitiser system",
};

const VALUE_LABELS: Partial<Record<GroupingKey, Record<string, string>>> = {
  "fill-source-kind": {
    municipal: "Municipal supply",
    "private-well": "Private well",
    "shared-well": "Shared well",
    trucked: "Trucked water",
    other: "Other",
  },
  "heater-age": {
    none: "No heater",
    unknown: "Heater of unknown age",
    "0-4": "0–4 years",
    "5-9": "5–9 years",
    "10-14": "10–14 years",
    "15+": "15 years or more",
  },
  "exchanger-metal": {
    "no-heater": "No heater",
    copper: "Copper",
    cupronickel: "Cupronickel",
    titanium: "Titanium",
    "none-unknown": "None or not known",
  },
  surface: { plaster: "Plaster", pebble: "Pebble", quartz: "Quartz", vinyl: "Vinyl", fibreglass: "Fibreglass", tile: "Tile" },
  sanitiser: {
    chlorine: "Chlorine",
    "salt-chlorine-generator": "Salt chlorine generator",
    "mineral-ioniser-assist": "Mineral / ioniser assist",
    other: "Other",
  },
};

/** A group's name for people; ids of sources and routes are resolved by the caller's names. */
export function groupValueLabel(key: GroupingKey, value: string, names: ReadonlyMap<string, string> = new Map()): string {
  if (value === "unknown" && key !== "heater-age") return "Not recorded";
  return names.get(value) ?? VALUE_LABELS[key]?.[value] ?? value;
}

export const ARM_LABELS = {
  product: "Product",
  category: "Category",
  combination: "Products used together",
  "category-combination": "Categories used together",
} as const;

export const CATEGORY_WORDS: Record<string, string> = {
  sequestrant: "Sequestrant",
  "metal-collector-pad": "Metal-collector pad",
  "ph-decreaser": "pH decreaser",
  "copper-algaecide": "Copper-based algaecide",
  "other-algaecide": "Other algaecide",
  chlorine: "Chlorine",
  other: "Other",
};

/** Long group or combination names are shortened on a chart's axis; the tip and the table keep them whole. */
export const shortLabel = (label: string) => (label.length > 36 ? `${label.slice(0, 35)}…` : label);
