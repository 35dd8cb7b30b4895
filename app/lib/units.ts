import { celsiusToFahrenheit, gallonsToLitres, litresToGallons } from "@analysis/units/convert";
import type { UnitSystem } from "./stored-values";

export type { UnitSystem } from "./stored-values";

export const VOLUME_UNIT: Record<UnitSystem, string> = { us: "gal", metric: "L" };
export const TEMPERATURE_UNIT: Record<UnitSystem, "°F" | "°C"> = { us: "°F", metric: "°C" };

/** Litres (canonical) to the company's volume unit, rounded to whole units. */
export function volumeInUnits(litres: number, units: UnitSystem): number {
  return Math.round(units === "us" ? litresToGallons(litres) : litres);
}

/** A volume typed in the company's unit, to whole litres for storage. */
export function volumeToLitres(amount: number, units: UnitSystem): number {
  return Math.round(units === "us" ? gallonsToLitres(amount) : amount);
}

export function formatVolume(litres: number | null | undefined, units: UnitSystem): string {
  if (litres === null || litres === undefined) return "—";
  return `${new Intl.NumberFormat("en").format(volumeInUnits(litres, units))} ${VOLUME_UNIT[units]}`;
}

export function formatTemperature(celsius: number | null | undefined, units: UnitSystem): string {
  if (celsius === null || celsius === undefined) return "—";
  const shown = units === "us" ? celsiusToFahrenheit(celsius) : celsius;
  return `${shown.toFixed(0)} ${TEMPERATURE_UNIT[units]}`;
}
