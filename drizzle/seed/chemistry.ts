// The simulation's water chemistry. The saturation index comes from the
// product's own analysis code, so the demo's corrosive spells are corrosive by
// the same rule the analytics apply.
import { carbonateAlkalinity, continuousSaturationIndex } from "../../analysis/chemistry/saturation";

export type Balance = {
  ph: number;
  totalAlkalinity: number;
  calciumHardness: number;
  cyanuricAcid: number;
  temperatureC: number;
  tds: number;
};

/** Continuous form, alkalinity corrected for cyanuric acid; floors keep the logarithms defined. */
export function saturationIndex(water: Balance): number {
  const alkalinity = Math.max(10, carbonateAlkalinity(water.totalAlkalinity, water.cyanuricAcid, water.ph));
  return continuousSaturationIndex(
    water.ph,
    Math.max(50, water.tds),
    water.temperatureC,
    Math.max(10, water.calciumHardness),
    alkalinity,
  );
}

/**
 * Seasonal water temperature, northern hemisphere: about 10 degC in mid-January
 * (covered pools) and 30 degC in mid-July.
 */
export function seasonalTemperature(dayOfYear: number): number {
  return 20 - 10 * Math.cos((2 * Math.PI * (dayOfYear - 15)) / 365);
}

/** 0 in mid-winter, 1 in mid-summer: drives evaporation, swimmers and heater use. */
export function summerness(dayOfYear: number): number {
  return (1 - Math.cos((2 * Math.PI * (dayOfYear - 15)) / 365)) / 2;
}
