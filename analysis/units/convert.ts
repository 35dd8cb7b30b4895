/**
 * Unit facts used across the analysis. Exact definitions are kept exact so
 * that round trips do not drift.
 */

/** NIST Handbook 44, appendix C: 1 US gallon = 231 in3 = 3.785411784 L exactly. */
export const LITRES_PER_US_GALLON = 3.785411784;

/** 1 ft3 = 1728 in3, and 1 US gallon = 231 in3. */
export const US_GALLONS_PER_CUBIC_FOOT = 1728 / 231;

export const LITRES_PER_CUBIC_METRE = 1000;

export const FEET_PER_METRE = 1 / 0.3048;

/** CIAAW 2021 standard atomic weights (abridged to the digits that matter here). */
export const ATOMIC_WEIGHT = {
  copper: 63.546,
  iron: 55.845,
  manganese: 54.938043,
  calcium: 40.078,
} as const;

/** Molar mass of calcium carbonate, g/mol. */
export const CALCIUM_CARBONATE_MOLAR_MASS = 100.086;

/** Hardness and alkalinity "as CaCO3" count equivalents of half a mole of CaCO3. */
export const CALCIUM_CARBONATE_EQUIVALENT_WEIGHT = CALCIUM_CARBONATE_MOLAR_MASS / 2;

export const SODIUM_BICARBONATE_MOLAR_MASS = 84.007;

export const KILOGRAMS_PER_POUND = 0.45359237;

export function fahrenheitToCelsius(degreesF: number): number {
  return ((degreesF - 32) * 5) / 9;
}

export function celsiusToFahrenheit(degreesC: number): number {
  return (degreesC * 9) / 5 + 32;
}

export function gallonsToLitres(gallons: number): number {
  return gallons * LITRES_PER_US_GALLON;
}

export function litresToGallons(litres: number): number {
  return litres / LITRES_PER_US_GALLON;
}

export function cubicFeetToGallons(cubicFeet: number): number {
  return cubicFeet * US_GALLONS_PER_CUBIC_FOOT;
}

export function cubicMetresToLitres(cubicMetres: number): number {
  return cubicMetres * LITRES_PER_CUBIC_METRE;
}

export function feetToMetres(feet: number): number {
  return feet / FEET_PER_METRE;
}

export function microgramsPerLitreToMilligramsPerLitre(microgramsPerLitre: number): number {
  return microgramsPerLitre / 1000;
}

/** Laboratory reports often give calcium as the element; pool work uses hardness as CaCO3. */
export function calciumAsCalciumToHardnessAsCaCO3(calciumMgPerLitre: number): number {
  return calciumMgPerLitre * (CALCIUM_CARBONATE_MOLAR_MASS / ATOMIC_WEIGHT.calcium);
}

export function hardnessAsCaCO3ToCalciumAsCalcium(hardnessMgPerLitre: number): number {
  return hardnessMgPerLitre / (CALCIUM_CARBONATE_MOLAR_MASS / ATOMIC_WEIGHT.calcium);
}

/**
 * Rise in total alkalinity (mg/L as CaCO3) from dissolving sodium bicarbonate:
 * one mole of bicarbonate neutralises one mole of acid, i.e. one CaCO3 equivalent.
 */
export function alkalinityRiseFromBicarbonate(bicarbonateKilograms: number, volumeLitres: number): number {
  const bicarbonateMgPerLitre = (bicarbonateKilograms * 1e6) / volumeLitres;
  return bicarbonateMgPerLitre * (CALCIUM_CARBONATE_EQUIVALENT_WEIGHT / SODIUM_BICARBONATE_MOLAR_MASS);
}

export function poundsToKilograms(pounds: number): number {
  return pounds * KILOGRAMS_PER_POUND;
}
