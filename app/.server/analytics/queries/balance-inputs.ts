import { and, isNotNull } from "drizzle-orm";
import { waterTests } from "../../db/schema";

/** The water-test columns the saturation index reads. */
export const BALANCE_COLUMNS = {
  ph: waterTests.ph,
  temperatureC: waterTests.temperatureC,
  calciumHardness: waterTests.calciumHardness,
  totalAlkalinity: waterTests.totalAlkalinity,
  cyanuricAcid: waterTests.cyanuricAcid,
  tds: waterTests.tds,
  salt: waterTests.salt,
};

/** Tests carrying the four inputs the saturation index cannot do without. */
export const balanceInputsPresent = and(
  isNotNull(waterTests.ph),
  isNotNull(waterTests.temperatureC),
  isNotNull(waterTests.calciumHardness),
  isNotNull(waterTests.totalAlkalinity),
)!;
