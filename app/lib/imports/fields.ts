/**
 * What a column of an imported log can mean. Analyte bounds are the accepted
 * input range in the canonical unit; anything outside is refused, never clipped.
 */
export const ANALYTE_FIELDS = {
  freeChlorine: { label: "Free chlorine", unit: "mg/L", min: 0, max: 50 },
  combinedChlorine: { label: "Combined chlorine", unit: "mg/L", min: 0, max: 50 },
  ph: { label: "pH", unit: "", min: 0, max: 14 },
  totalAlkalinity: { label: "Total alkalinity", unit: "mg/L as CaCO3", min: 0, max: 500 },
  calciumHardness: { label: "Calcium hardness", unit: "mg/L as CaCO3", min: 0, max: 2000 },
  cyanuricAcid: { label: "Cyanuric acid", unit: "mg/L", min: 0, max: 300 },
  salt: { label: "Salt", unit: "mg/L", min: 0, max: 20000 },
  tds: { label: "TDS", unit: "mg/L", min: 0, max: 20000 },
  temperatureC: { label: "Temperature", unit: "degC", min: 0, max: 45 },
  copper: { label: "Copper", unit: "mg/L", min: 0, max: 10 },
  iron: { label: "Iron", unit: "mg/L", min: 0, max: 10 },
  manganese: { label: "Manganese", unit: "mg/L", min: 0, max: 10 },
} as const;

export type AnalyteField = keyof typeof ANALYTE_FIELDS;
export const ANALYTES = Object.keys(ANALYTE_FIELDS) as AnalyteField[];

export const METAL_FIELDS = ["copper", "iron", "manganese"] as const satisfies readonly AnalyteField[];
export type MetalField = (typeof METAL_FIELDS)[number];

export const OTHER_FIELDS = {
  accountCode: "Account code",
  address: "Street address",
  customerName: "Customer name",
  neighbourhood: "Neighbourhood",
  postalCode: "Postal code",
  sampledAt: "Sample date (and time)",
  sampleTime: "Sample time",
  note: "Note",
  product: "Treatment product",
  amount: "Treatment amount",
  amountUnit: "Treatment unit",
  cost: "Treatment cost",
} as const;

export type OtherField = keyof typeof OTHER_FIELDS;
export type ImportField = AnalyteField | OtherField;
export type ColumnTarget = ImportField | "ignore";

export const IMPORT_FIELDS: readonly ImportField[] = [
  ...(Object.keys(OTHER_FIELDS) as OtherField[]),
  ...ANALYTES,
];

export function fieldLabel(target: ColumnTarget): string {
  if (target === "ignore") return "Leave out";
  if (target in ANALYTE_FIELDS) return ANALYTE_FIELDS[target as AnalyteField].label;
  return OTHER_FIELDS[target as OtherField];
}

export function isMetal(target: ColumnTarget): target is MetalField {
  return (METAL_FIELDS as readonly string[]).includes(target);
}

/** Units a column can be read in; each converts to the field's canonical unit. */
export const COLUMN_UNITS = {
  degC: "°C",
  degF: "°F",
  mgL: "mg/L (ppm)",
  ugL: "µg/L (ppb)",
} as const;
export type ColumnUnit = keyof typeof COLUMN_UNITS;

export function unitsFor(target: ColumnTarget): ColumnUnit[] {
  if (target === "temperatureC") return ["degF", "degC"];
  if (isMetal(target)) return ["mgL", "ugL"];
  return [];
}

/** One column of the file and what it is read as. */
export type ColumnMapping = { field: ColumnTarget; unit?: ColumnUnit };
