import { z } from "zod";
import { requiredChoice, requiredNumber } from "./fields";

const level = (label: string) => requiredNumber({ label, min: 0, max: 10, unit: "mg/L" });

export function isKnownTimeZone(name: string): boolean {
  return name === "UTC" || Intl.supportedValuesOf("timeZone").includes(name);
}

export const settingsForm = z
  .object({
    copperElevated: level("Copper elevated"),
    copperClear: level("Copper clear"),
    ironElevated: level("Iron elevated"),
    ironClear: level("Iron clear"),
    manganeseElevated: level("Manganese elevated"),
    manganeseClear: level("Manganese clear"),
    balanceLow: requiredNumber({ label: "Balanced from", min: -2, max: 0 }),
    balanceHigh: requiredNumber({ label: "Balanced up to", min: 0, max: 2 }),
    unitSystem: requiredChoice("Units", ["us", "metric"]),
    timeZone: z
      .string({ error: "Time zone: choose one." })
      .trim()
      .refine(isKnownTimeZone, { error: (iss) => `Time zone: "${String(iss.input)}" is not a known time zone (e.g. America/New_York).` }),
  })
  .superRefine((v, ctx) => {
    for (const metal of ["copper", "iron", "manganese"] as const) {
      const elevated = v[`${metal}Elevated`];
      const clear = v[`${metal}Clear`];
      const label = metal[0]!.toUpperCase() + metal.slice(1);
      if (!(clear > 0)) {
        ctx.addIssue({ code: "custom", path: [`${metal}Clear`], message: `${label} clear: ${clear} mg/L must be above 0.` });
      } else if (!(elevated >= clear)) {
        ctx.addIssue({
          code: "custom",
          path: [`${metal}Elevated`],
          message: `${label} elevated: ${elevated} mg/L must not be below the clear level, ${clear} mg/L.`,
        });
      }
    }
    if (!(v.balanceLow < v.balanceHigh)) {
      ctx.addIssue({ code: "custom", path: ["balanceHigh"], message: `Balanced up to: ${v.balanceHigh} must be above ${v.balanceLow}.` });
    }
  });

export type SettingsInput = z.output<typeof settingsForm>;
