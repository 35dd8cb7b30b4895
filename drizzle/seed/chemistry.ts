// Just enough water chemistry to drive the simulation; the product's own
// analysis code lives elsewhere and is not imported here so the seed stays
// self-contained.

export type Balance = {
  ph: number;
  totalAlkalinity: number;
  calciumHardness: number;
  cyanuricAcid: number;
  temperatureC: number;
  tds: number;
};

/** Langelier saturation index, continuous form, alkalinity corrected for cyanuric acid. */
export function saturationIndex(water: Balance): number {
  const cyaFactor = 0.3877 / (1 + 10 ** (6.83 - water.ph));
  const carbonateAlkalinity = Math.max(10, water.totalAlkalinity - water.cyanuricAcid * cyaFactor);
  const a = (Math.log10(Math.max(50, water.tds)) - 1) / 10;
  const b = -13.12 * Math.log10(water.temperatureC + 273) + 34.55;
  const c = Math.log10(Math.max(10, water.calciumHardness)) - 0.4;
  const d = Math.log10(carbonateAlkalinity);
  return water.ph - (9.3 + a + b - (c + d));
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
