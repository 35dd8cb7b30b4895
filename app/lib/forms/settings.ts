import { z } from "zod";
import { type FieldErrors, fieldErrorsOf, requiredChoice, requiredNumber } from "./fields";
import type { Parsed } from "./routebook";
import { UNIT_SYSTEMS } from "../stored-values";

const METAL_NAMES = ["copper", "iron", "manganese"] as const;
const METAL_LABEL = { copper: "Copper", iron: "Iron", manganese: "Manganese" } as const;

const level = (label: string) => requiredNumber({ label, min: 0, max: 10, unit: "mg/L" });

/** A clear level of 0 would never let an episode close. */
const clearLevel = (label: string) =>
  level(label).superRefine((value, ctx) => {
    if (!(value > 0)) ctx.addIssue({ code: "custom", message: `${label}: ${value} mg/L must be above 0.` });
  });

export function isKnownCurrency(code: string): boolean {
  return Intl.supportedValuesOf("currency").includes(code);
}

export function isKnownTimeZone(name: string): boolean {
  return name === "UTC" || Intl.supportedValuesOf("timeZone").includes(name);
}

const settingsFields = {
  copperElevated: level("Copper elevated"),
  copperClear: clearLevel("Copper clear"),
  ironElevated: level("Iron elevated"),
  ironClear: clearLevel("Iron clear"),
  manganeseElevated: level("Manganese elevated"),
  manganeseClear: clearLevel("Manganese clear"),
  balanceLow: requiredNumber({ label: "Balanced from", min: -2, max: 0 }),
  balanceHigh: requiredNumber({ label: "Balanced up to", min: 0, max: 2 }),
  unitSystem: requiredChoice("Units", UNIT_SYSTEMS),
  timeZone: z
    .string({ error: "Time zone: choose one." })
    .trim()
    .refine(isKnownTimeZone, { error: (iss) => `Time zone: "${String(iss.input)}" is not a known time zone (e.g. America/New_York).` }),
  // Left out of a post, the company's currency stays as it is.
  currency: z
    .string({ error: "Currency: choose one." })
    .trim()
    .toUpperCase()
    .refine(isKnownCurrency, { error: (iss) => `Currency: "${String(iss.input)}" is not a known currency code (e.g. USD, EUR, GBP).` })
    .optional(),
};

type SettingsField = keyof typeof settingsFields;

export const settingsForm = z.object(settingsFields);
export type SettingsInput = z.output<typeof settingsForm>;

/** One field read on its own; undefined when it is not valid by itself. */
function fieldValue<K extends SettingsField>(raw: Record<string, unknown>, name: K): SettingsInput[K] | undefined {
  const parsed = settingsFields[name].safeParse(raw[name]);
  return parsed.success ? (parsed.data as SettingsInput[K]) : undefined;
}

/**
 * Checks between fields (elevated not below clear, balance band the right way
 * round), run on every pair whose two values are valid by themselves, so one
 * bad entry elsewhere does not hide them.
 */
function crossFieldErrors(raw: Record<string, unknown>): FieldErrors {
  const errors: FieldErrors = {};
  for (const metal of METAL_NAMES) {
    const elevated = fieldValue(raw, `${metal}Elevated`);
    const clear = fieldValue(raw, `${metal}Clear`);
    if (elevated !== undefined && clear !== undefined && !(elevated >= clear)) {
      errors[`${metal}Elevated`] = `${METAL_LABEL[metal]} elevated: ${elevated} mg/L must not be below the clear level, ${clear} mg/L.`;
    }
  }
  const low = fieldValue(raw, "balanceLow");
  const high = fieldValue(raw, "balanceHigh");
  if (low !== undefined && high !== undefined && !(low < high)) {
    errors.balanceHigh = `Balanced up to: ${high} must be above ${low}.`;
  }
  return errors;
}

/** The settings form with every refusal at once: each field's own, then those between fields. */
export function parseSettingsForm(raw: Record<string, unknown>): Parsed<SettingsInput> {
  const parsed = settingsForm.safeParse(raw);
  // A field's own problem is the one to fix first; a cross-field note fills only fields without one.
  const errors: FieldErrors = { ...crossFieldErrors(raw), ...(parsed.success ? {} : fieldErrorsOf(parsed.error)) };
  if (!parsed.success || Object.keys(errors).length > 0) return { ok: false, fieldErrors: errors };
  return { ok: true, value: parsed.data };
}
