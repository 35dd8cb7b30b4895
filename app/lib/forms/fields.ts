import { plainPositiveInt } from "../strict-params";
import { z as zod } from "zod";
import { parseDecimal } from "@analysis/units/decimal";

/** Field name -> first message, as the forms show them beside each input. */
export type FieldErrors = Record<string, string>;

export function fieldErrorsOf(error: zod.ZodError): FieldErrors {
  const errors: FieldErrors = {};
  for (const issue of error.issues) {
    const key = issue.path.length > 0 ? issue.path.map(String).join(".") : "form";
    errors[key] ??= issue.message;
  }
  return errors;
}

/** The one shape every form action answers with when it refuses input. */
export type FormRefusal = { ok: false; fieldErrors: FieldErrors; formError: string | null };

export function refusal(fieldErrors: FieldErrors, formError: string | null = null): FormRefusal {
  return { ok: false, fieldErrors, formError };
}

/** FormData as a plain object, repeated names kept as arrays only where asked. */
export function formObject(form: FormData, repeated: readonly string[] = []): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const key of new Set(form.keys())) {
    const values = form.getAll(key).map((v) => (typeof v === "string" ? v : ""));
    out[key] = repeated.includes(key) ? values : values[values.length - 1];
  }
  for (const key of repeated) out[key] ??= [];
  return out;
}

export type NumberRule = { label: string; min: number; max: number; unit?: string; integer?: boolean };

export type NumberParse = { ok: true; value: number | null } | { ok: false; message: string };

function withUnit(value: number, unit?: string) {
  return unit ? `${value} ${unit}` : String(value);
}

/**
 * Reads a typed number ("7.4", "7,4", " 12 "); empty means not given. Refusals
 * name the field, the value and the bound that was crossed.
 */
export function parseBoundedNumber(raw: unknown, rule: NumberRule): NumberParse {
  const text = typeof raw === "string" ? raw.trim() : raw == null ? "" : String(raw);
  if (text === "") return { ok: true, value: null };
  const value = parseDecimal(text, { decimalComma: true, negative: true });
  if (value === null) return { ok: false, message: `${rule.label}: "${text}" is not a number.` };
  if (rule.integer && !Number.isInteger(value)) {
    return { ok: false, message: `${rule.label}: ${text} must be a whole number.` };
  }
  if (value < rule.min) {
    return { ok: false, message: `${rule.label}: ${withUnit(value, rule.unit)} is below the lowest accepted value, ${withUnit(rule.min, rule.unit)}.` };
  }
  if (value > rule.max) {
    return { ok: false, message: `${rule.label}: ${withUnit(value, rule.unit)} is above the highest accepted value, ${withUnit(rule.max, rule.unit)}.` };
  }
  return { ok: true, value };
}

// ---------------------------------------------------------------------------
// zod building blocks whose messages name the field and the value


export function requiredText(label: string, max: number) {
  return zod
    .string({ error: `${label}: enter a value.` })
    .trim()
    .min(1, { error: `${label}: enter a value.` })
    .max(max, { error: (iss) => `${label}: "${String(iss.input).slice(0, 40)}…" is longer than ${max} characters.` });
}

export function optionalText(label: string, max: number) {
  return zod
    .string()
    .trim()
    .max(max, { error: `${label}: longer than ${max} characters.` })
    .optional()
    .transform((v) => (v ? v : null));
}

export function optionalEmail(label: string) {
  return zod
    .string()
    .trim()
    .optional()
    .transform((v, ctx) => {
      if (!v) return null;
      if (!zod.email().safeParse(v).success) {
        ctx.addIssue({ code: "custom", message: `${label}: "${v}" is not an e-mail address.` });
        return zod.NEVER;
      }
      return v;
    });
}

function listOf(values: readonly string[]) {
  return values.join(", ");
}

export function requiredChoice<const T extends readonly [string, ...string[]]>(label: string, values: T) {
  return zod.enum(values, {
    error: (iss) =>
      iss.input === undefined || iss.input === ""
        ? `${label}: choose one.`
        : `${label}: "${String(iss.input)}" is not one of ${listOf(values)}.`,
  });
}

export function optionalChoice<const T extends readonly [string, ...string[]]>(label: string, values: T) {
  return zod
    .string()
    .optional()
    .transform((v, ctx): T[number] | null => {
      if (!v) return null;
      if (!(values as readonly string[]).includes(v)) {
        ctx.addIssue({ code: "custom", message: `${label}: "${v}" is not one of ${listOf(values)}.` });
        return zod.NEVER;
      }
      return v as T[number];
    });
}

export function optionalNumber(rule: NumberRule) {
  return zod.unknown().transform((raw, ctx): number | null => {
    const parsed = parseBoundedNumber(raw, rule);
    if (!parsed.ok) {
      ctx.addIssue({ code: "custom", message: parsed.message });
      return zod.NEVER;
    }
    return parsed.value;
  });
}

export function requiredNumber(rule: NumberRule) {
  return zod.unknown().transform((raw, ctx): number => {
    const parsed = parseBoundedNumber(raw, rule);
    if (!parsed.ok || parsed.value === null) {
      ctx.addIssue({ code: "custom", message: parsed.ok ? `${rule.label}: enter a number.` : parsed.message });
      return zod.NEVER;
    }
    return parsed.value;
  });
}

/** An optional reference to another row by its id ("" = none). */
export function optionalId(label: string) {
  return zod
    .string()
    .optional()
    .transform((v, ctx): number | null => {
      if (!v) return null;
      const n = plainPositiveInt(v);
      if (n === null) {
        ctx.addIssue({ code: "custom", message: `${label}: "${v}" is not a valid choice.` });
        return zod.NEVER;
      }
      return n;
    });
}

const ISO_DATE = /^\d{4}-\d{2}-\d{2}$/;

export function isIsoDate(text: string): boolean {
  if (!ISO_DATE.test(text)) return false;
  const date = new Date(`${text}T00:00:00Z`);
  return !Number.isNaN(date.getTime()) && date.toISOString().slice(0, 10) === text;
}

export function optionalDate(label: string) {
  return zod
    .string()
    .trim()
    .optional()
    .transform((v, ctx): string | null => {
      if (!v) return null;
      if (!isIsoDate(v)) {
        ctx.addIssue({ code: "custom", message: `${label}: "${v}" is not a date (YYYY-MM-DD).` });
        return zod.NEVER;
      }
      return v;
    });
}

export function requiredDate(label: string) {
  return optionalDate(label).transform((v, ctx): string => {
    if (v === null) {
      ctx.addIssue({ code: "custom", message: `${label}: enter a date.` });
      return zod.NEVER;
    }
    return v;
  });
}

export const checkbox = zod
  .string()
  .optional()
  .transform((v) => v === "on" || v === "true" || v === "1");
