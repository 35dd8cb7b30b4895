import { z } from "zod";
import { readInstant, type DateOrder } from "./dates";
import { isMissing, readNumber, readReading, type NumberStyle } from "./cells";
import {
  ANALYTE_FIELDS,
  ANALYTES,
  type AnalyteField,
  type ColumnMapping,
  fieldLabel,
  type ImportField,
  isMetal,
  type MetalField,
} from "./fields";
import { characterCount, shownValue, TEXT_LIMITS } from "./limits";
import { readAccountKey } from "./match-keys";

export type Refusal = { row: number; column: string; value: string; reason: string };

export type ImportedTest = Partial<Record<AnalyteField, number>> &
  Partial<Record<`${MetalField}BelowDetection`, boolean>> & { note?: string };

export type ImportedTreatment = { product: string; amount: number; unit: string; cost: number | null };

export type ImportRecord = {
  row: number;
  accountCode: string | null;
  address: string | null;
  customerName: string | null;
  neighbourhood: string | null;
  postalCode: string | null;
  sampledAt: Date;
  test: ImportedTest | null;
  treatment: ImportedTreatment | null;
};

export type RowContext = {
  headers: readonly string[];
  columns: readonly ColumnMapping[];
  dateOrder: DateOrder | null;
  timeZone: string;
  style: NumberStyle;
};

function boundedNumber(field: AnalyteField) {
  const { label, unit, min, max } = ANALYTE_FIELDS[field];
  const withUnit = (n: unknown) => (unit ? `${n} ${unit}` : `${n}`);
  return z
    .number()
    .min(min, { error: (issue) => `${label} ${withUnit(issue.input)} is below the accepted minimum of ${withUnit(min)}` })
    .max(max, { error: (issue) => `${label} ${withUnit(issue.input)} is above the accepted maximum of ${withUnit(max)}` });
}

/** The accepted input range of every analyte, checked on the canonical values. */
export const importedTestSchema = z.object(
  Object.fromEntries(ANALYTES.map((field) => [field, boundedNumber(field).optional()])) as Record<
    AnalyteField,
    z.ZodOptional<z.ZodNumber>
  >,
);

const treatmentSchema = z.object({
  product: z.string().min(1).max(TEXT_LIMITS.product, { error: `Treatment product name is longer than ${TEXT_LIMITS.product} characters` }),
  amount: z
    .number()
    .positive({ error: (issue) => `Treatment amount ${issue.input} must be above 0` })
    .max(9_999_999, { error: (issue) => `Treatment amount ${issue.input} is above the accepted maximum of 9,999,999` }),
  unit: z.string().min(1).max(TEXT_LIMITS.amountUnit, { error: `Treatment unit is longer than ${TEXT_LIMITS.amountUnit} characters` }),
  cost: z.number().min(0, { error: (issue) => `Treatment cost ${issue.input} is negative` }).max(99_999_999).nullable(),
});

/** Unit words an amount cell may end with ("16 oz", "2.5 lb"). */
const AMOUNT_WITH_UNIT = /^([\d.,\s]+?)\s*([a-zA-Z][a-zA-Z .]{0,15})$/;

/** Control and format characters (NUL, zero-width, soft hyphen...) are never stored. */
const UNSTORED = /[\p{Cc}\p{Cf}]/gu;
// Notes keep tab and line breaks, so the control range is spelled out.
// eslint-disable-next-line no-control-regex
const UNSTORED_IN_NOTES = /[\p{Cf}\x00-\x08\x0b\x0c\x0e-\x1f\x7f-\x9f]/gu;

function textOrNull(text: string | undefined, unstored = UNSTORED): string | null {
  const trimmed = text?.replace(unstored, "").trim() ?? "";
  return trimmed === "" || isMissing(trimmed) ? null : trimmed;
}

/**
 * Turns one row of the file into a record to store, or the reasons it is
 * refused (every problem cell, each with its column and value).
 */
export function validateRow(
  cells: readonly string[],
  row: number,
  context: RowContext,
): { ok: true; record: ImportRecord } | { ok: false; refusals: Refusal[] } {
  const refusals: Refusal[] = [];
  const byField = new Map<ImportField, { text: string; column: string; index: number }>();
  context.columns.forEach((mapping, index) => {
    if (mapping.field === "ignore") return;
    byField.set(mapping.field, { text: cells[index] ?? "", column: context.headers[index] ?? `column ${index + 1}`, index });
  });
  const refuse = (field: ImportField, reason: string) => {
    const cell = byField.get(field);
    const value = cell?.text ?? "";
    // A huge cell is shown cut, in the value and in a reason that quotes it.
    const shown = shownValue(value);
    const said = shown === value ? reason : reason.split(value.trim()).join(shownValue(value.trim()));
    refusals.push({ row, column: cell?.column ?? fieldLabel(field), value: shown, reason: said });
  };
  const text = (field: ImportField) => textOrNull(byField.get(field)?.text);

  let accountCode = text("accountCode");
  const address = text("address");
  if (!accountCode && !address) {
    refusals.push({
      row,
      column: byField.get("accountCode")?.column ?? byField.get("address")?.column ?? "Account code",
      value: "",
      reason: "has neither an account code nor an address, so the pool is unknown",
    });
  }
  if (accountCode) {
    // Matched and stored as the database compares codes, so look-alikes are one pool.
    const key = readAccountKey(accountCode);
    if (key.ok) accountCode = key.key;
    else refuse("accountCode", key.reason);
  }
  for (const field of ["address", "customerName", "neighbourhood", "postalCode"] as const) {
    const value = text(field);
    const length = value ? characterCount(value) : 0;
    if (length > TEXT_LIMITS[field]) {
      refuse(field, `${fieldLabel(field)} is ${length.toLocaleString("en")} characters long; at most ${TEXT_LIMITS[field]} are stored`);
    }
  }

  let sampledAt: Date | null = null;
  const dateText = byField.get("sampledAt")?.text ?? "";
  if (!byField.has("sampledAt")) {
    refusals.push({ row, column: "Sample date", value: "", reason: "no column is read as the sample date" });
  } else if (isMissing(dateText)) {
    refuse("sampledAt", "Sample date is missing");
  } else {
    const instant = readInstant(dateText, byField.get("sampleTime")?.text, context.dateOrder, context.timeZone);
    if (instant.ok) sampledAt = instant.value;
    else refuse("sampledAt", `Sample date ${instant.reason}`);
  }

  const test: ImportedTest = {};
  let analyteCount = 0;
  for (const field of ANALYTES) {
    const cell = byField.get(field);
    if (!cell) continue;
    const kind = isMetal(field) ? "metal" : field === "temperatureC" ? "temperature" : "plain";
    const read = readReading(cell.text, kind, context.columns[cell.index]?.unit, context.style);
    if (!read.ok) {
      refuse(field, `${ANALYTE_FIELDS[field].label} "${cell.text.trim()}" ${read.reason}`);
      continue;
    }
    if (read.value === null) continue;
    test[field] = read.value;
    if (isMetal(field)) test[`${field}BelowDetection`] = read.belowDetection;
    analyteCount++;
  }
  const bounds = importedTestSchema.safeParse(test);
  if (!bounds.success) {
    for (const issue of bounds.error.issues) refuse(issue.path[0] as AnalyteField, issue.message);
  }
  const note = textOrNull(byField.get("note")?.text, UNSTORED_IN_NOTES);
  if (note) test.note = note.slice(0, 2000);

  let treatment: ImportedTreatment | null = null;
  const product = text("product");
  const amountText = text("amount");
  if (product || amountText) {
    treatment = readTreatment(product, amountText, text("amountUnit"), text("cost"), context, refuse);
  }

  if (analyteCount === 0 && !treatment && refusals.length === 0) {
    refusals.push({ row, column: "(whole row)", value: "", reason: "has no test value and no treatment" });
  }
  if (refusals.length > 0 || !sampledAt) return { ok: false, refusals };
  return {
    ok: true,
    record: {
      row,
      accountCode,
      address,
      customerName: text("customerName"),
      neighbourhood: text("neighbourhood"),
      postalCode: text("postalCode"),
      sampledAt,
      test: analyteCount > 0 ? test : null,
      treatment,
    },
  };
}

function readTreatment(
  product: string | null,
  amountText: string | null,
  unitText: string | null,
  costText: string | null,
  context: RowContext,
  refuse: (field: ImportField, reason: string) => void,
): ImportedTreatment | null {
  if (!product) {
    refuse("product", "Treatment amount is given but the product is missing");
    return null;
  }
  if (!amountText) {
    refuse("amount", `Treatment amount for "${product}" is missing`);
    return null;
  }
  let number = amountText;
  let unit = unitText;
  const withUnit = AMOUNT_WITH_UNIT.exec(amountText);
  if (withUnit) {
    number = withUnit[1]!;
    unit ??= withUnit[2]!.trim();
  }
  const amount = readNumber(number, context.style);
  if (!amount.ok) {
    refuse("amount", `Treatment amount "${amountText}" ${amount.reason}`);
    return null;
  }
  if (!unit) {
    refuse("amount", `Treatment amount "${amountText}" has no unit (add a unit column or write e.g. "16 oz")`);
    return null;
  }
  let cost: number | null = null;
  if (costText) {
    const read = readNumber(costText.replace(/^[$€£]\s*/, ""), context.style);
    if (!read.ok) {
      refuse("cost", `Treatment cost "${costText}" ${read.reason}`);
      return null;
    }
    cost = read.value;
  }
  const parsed = treatmentSchema.safeParse({ product, amount: amount.value, unit, cost });
  if (!parsed.success) {
    const issue = parsed.error.issues[0]!;
    refuse((issue.path[0] === "cost" ? "cost" : issue.path[0] === "product" ? "product" : "amount") as ImportField, issue.message);
    return null;
  }
  return parsed.data;
}
