import { fahrenheitToCelsius } from "@analysis/units/convert";
import type { Metal, MetalReading } from "@analysis/metals/reading";
import { parseMetalReading } from "@analysis/metals/parse-reading";
import { type FieldErrors, parseBoundedNumber } from "./fields";
import { HARDNESS_ENDPOINTS, PAD_TINTS, STAIN_COLOURS, STAIN_STATES } from "../stored-values";

/** Analytes typed as plain numbers, with the hard bounds of accepted input (canonical units). */
export const NUMERIC_ANALYTES = [
  { key: "freeChlorine", label: "Free chlorine", unit: "mg/L", min: 0, max: 50 },
  { key: "combinedChlorine", label: "Combined chlorine", unit: "mg/L", min: 0, max: 50 },
  { key: "ph", label: "pH", unit: "", min: 0, max: 14 },
  { key: "totalAlkalinity", label: "Total alkalinity", unit: "mg/L", min: 0, max: 500 },
  { key: "calciumHardness", label: "Calcium hardness", unit: "mg/L", min: 0, max: 2000 },
  { key: "cyanuricAcid", label: "Cyanuric acid", unit: "mg/L", min: 0, max: 300 },
  { key: "salt", label: "Salt", unit: "mg/L", min: 0, max: 20_000 },
  { key: "tds", label: "TDS", unit: "mg/L", min: 0, max: 20_000 },
] as const;

export type NumericAnalyte = (typeof NUMERIC_ANALYTES)[number]["key"];

export const TEMPERATURE_BOUNDS_C = { min: 0, max: 45 } as const;

export const VISIT_METALS: ReadonlyArray<{ key: Metal; label: string }> = [
  { key: "copper", label: "Copper" },
  { key: "iron", label: "Iron" },
  { key: "manganese", label: "Manganese" },
];

/** pH outside this is worth a second look, but may be real: warn, do not refuse. */
export const PH_WARNING = { low: 6.0, high: 9.0 } as const;

export type VisitReadings = Partial<Record<NumericAnalyte, number>> & {
  temperatureC?: number;
} & Partial<Record<Metal, MetalReading>>;

/**
 * Reads a temperature typed in °C or °F ("82", "82F", "28 °C"); a suffix wins
 * over the unit toggle. Bounds are checked in °C, where they are defined.
 */
export function parseTemperature(
  raw: unknown,
  toggle: "C" | "F",
): { ok: true; celsius: number | null } | { ok: false; message: string } {
  const text = typeof raw === "string" ? raw.trim() : "";
  if (text === "") return { ok: true, celsius: null };
  const match = /^(.*?)\s*°?\s*([cCfF])$/.exec(text);
  const unit = match ? (match[2]!.toUpperCase() as "C" | "F") : toggle;
  // Wide bounds here only reject non-numbers; the real bounds are checked in °C below.
  const number = parseBoundedNumber(match ? match[1] : text, { label: "Temperature", min: -1000, max: 1000 });
  if (!number.ok || number.value === null) return { ok: false, message: `Temperature: "${text}" is not a temperature.` };
  const celsius = unit === "F" ? fahrenheitToCelsius(number.value) : number.value;
  const shown = unit === "F" ? `${number.value} °F (${celsius.toFixed(1)} °C)` : `${number.value} °C`;
  if (celsius < TEMPERATURE_BOUNDS_C.min) {
    return { ok: false, message: `Temperature: ${shown} is below the lowest accepted value, ${TEMPERATURE_BOUNDS_C.min} °C (32 °F).` };
  }
  if (celsius > TEMPERATURE_BOUNDS_C.max) {
    return { ok: false, message: `Temperature: ${shown} is above the highest accepted value, ${TEMPERATURE_BOUNDS_C.max} °C (113 °F).` };
  }
  return { ok: true, celsius: Math.round(celsius * 10) / 10 };
}

/**
 * Every reading of the visit form, checked against the hard bounds. Used by
 * the action (authoritative) and by the form as the technician types.
 */
export function parseVisitReadings(raw: Record<string, unknown>): { readings: VisitReadings; errors: FieldErrors } {
  const readings: VisitReadings = {};
  const errors: FieldErrors = {};
  for (const analyte of NUMERIC_ANALYTES) {
    const parsed = parseBoundedNumber(raw[analyte.key], analyte);
    if (!parsed.ok) errors[analyte.key] = parsed.message;
    else if (parsed.value !== null) readings[analyte.key] = parsed.value;
  }
  const temperature = parseTemperature(raw.temperature, raw.temperatureUnit === "F" ? "F" : "C");
  if (!temperature.ok) errors.temperature = temperature.message;
  else if (temperature.celsius !== null) readings.temperatureC = temperature.celsius;
  for (const metal of VISIT_METALS) {
    const parsed = parseMetalReading(typeof raw[metal.key] === "string" ? (raw[metal.key] as string) : "", metal.label);
    if (!parsed.ok) errors[metal.key] = `${parsed.message} (mg/L, 0 to 10; "<0.05" for below detection).`;
    else if (parsed.reading) readings[metal.key] = parsed.reading;
  }
  return { readings, errors };
}

export function hasMetalReading(readings: VisitReadings): boolean {
  return VISIT_METALS.some((m) => readings[m.key] !== undefined);
}

// ---------------------------------------------------------------------------
// The whole visit form


export { HARDNESS_ENDPOINTS, PAD_TINTS, STAIN_COLOURS, STAIN_STATES };

export type TreatmentLine = { productId: number; amount: number; unit: string | null };

export type VisitInput = {
  submissionKey: string;
  readings: VisitReadings;
  hardnessEndpoint: (typeof HARDNESS_ENDPOINTS)[number] | null;
  stain: (typeof STAIN_STATES)[number] | null;
  stainColour: (typeof STAIN_COLOURS)[number] | null;
  padTint: (typeof PAD_TINTS)[number] | null;
  note: string | null;
  treatments: TreatmentLine[];
};

/** The treatment lines' inputs, repeated once per line. */
export const TREATMENT_FIELDS = ["treatmentProduct", "treatmentAmount", "treatmentUnit"] as const;

/** The visit form as typed: one string per field, a list per treatment column. */
export type TypedVisit = Record<string, string | string[]>;

/** The typed values of a posted form, to put back into the inputs when the server refuses it. */
export function typedVisit(raw: Record<string, unknown>): TypedVisit {
  const typed: TypedVisit = {};
  for (const [name, value] of Object.entries(raw)) {
    if (typeof value === "string") typed[name] = value.slice(0, 2000);
    else if (Array.isArray(value)) typed[name] = value.slice(0, 50).map((v) => (typeof v === "string" ? v.slice(0, 100) : ""));
  }
  return typed;
}

const SUBMISSION_KEY = /^[A-Za-z0-9-]{8,64}$/;

function choice<T extends readonly string[]>(raw: unknown, values: T, label: string, field: string, errors: FieldErrors): T[number] | null {
  const text = typeof raw === "string" ? raw : "";
  if (text === "") return null;
  if ((values as readonly string[]).includes(text)) return text as T[number];
  errors[field] = `${label}: "${text}" is not one of ${values.join(", ")}.`;
  return null;
}

function column(raw: Record<string, unknown>, name: string): string[] {
  const value = raw[name];
  if (Array.isArray(value)) return value.map((v) => (typeof v === "string" ? v : ""));
  return typeof value === "string" ? [value] : [];
}

/** The visit form as submitted: readings, observations and treatment lines. */
export function parseVisitForm(raw: Record<string, unknown>): { ok: true; value: VisitInput } | { ok: false; fieldErrors: FieldErrors; formError: string | null } {
  const { readings, errors } = parseVisitReadings(raw);
  const submissionKey = typeof raw.submissionKey === "string" ? raw.submissionKey : "";
  if (!SUBMISSION_KEY.test(submissionKey)) errors.submissionKey = "Submission key: missing or malformed; reload the form.";
  const hardnessEndpoint = choice(raw.hardnessEndpoint, HARDNESS_ENDPOINTS, "Hardness endpoint", "hardnessEndpoint", errors);
  const stain = choice(raw.stain, STAIN_STATES, "Stain", "stain", errors);
  const stainColour = choice(raw.stainColour, STAIN_COLOURS, "Stain colour", "stainColour", errors);
  const padTint = choice(raw.padTint, PAD_TINTS, "Collector pad", "padTint", errors);
  const noteText = typeof raw.note === "string" ? raw.note.trim() : "";
  if (noteText.length > 2000) errors.note = `Note: ${noteText.length} characters is longer than 2000.`;

  const products = column(raw, "treatmentProduct");
  const amounts = column(raw, "treatmentAmount");
  const units = column(raw, "treatmentUnit");
  const treatments: TreatmentLine[] = [];
  const lines = Math.max(products.length, amounts.length);
  for (let i = 0; i < lines; i++) {
    const product = (products[i] ?? "").trim();
    const amountText = (amounts[i] ?? "").trim();
    if (product === "" && amountText === "") continue;
    const productId = Number(product);
    if (!Number.isInteger(productId) || productId <= 0) {
      errors[`treatments.${i}.product`] = `Treatment ${i + 1} product: choose a product.`;
      continue;
    }
    const amount = parseBoundedNumber(amountText, { label: `Treatment ${i + 1} amount`, min: 0.001, max: 100_000 });
    if (!amount.ok) errors[`treatments.${i}.amount`] = amount.message;
    else if (amount.value === null) errors[`treatments.${i}.amount`] = `Treatment ${i + 1} amount: enter how much was given.`;
    const unit = (units[i] ?? "").trim();
    if (unit.length > 16) errors[`treatments.${i}.unit`] = `Treatment ${i + 1} unit: "${unit}" is longer than 16 characters.`;
    if (amount.ok && amount.value !== null) treatments.push({ productId, amount: amount.value, unit: unit || null });
  }

  if (Object.keys(errors).length > 0) return { ok: false, fieldErrors: errors, formError: "Some entries need a look; nothing was saved." };
  const anything =
    Object.keys(readings).length > 0 || hardnessEndpoint || stain || padTint || noteText || treatments.length > 0;
  if (!anything) {
    return { ok: false, fieldErrors: {}, formError: "Enter at least one reading, observation or treatment; nothing was saved." };
  }
  return {
    ok: true,
    value: {
      submissionKey,
      readings,
      hardnessEndpoint,
      stain,
      // A colour only means something when there is a stain.
      stainColour: stain === "new" || stain === "existing" ? stainColour : null,
      padTint,
      note: noteText || null,
      treatments,
    },
  };
}
