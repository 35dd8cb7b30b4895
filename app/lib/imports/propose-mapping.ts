import { type ColumnMapping, type ColumnTarget, type ColumnUnit, unitsFor } from "./fields";

/** Lower case, accents folded, everything but letters and digits turned into single spaces. */
export function normaliseHeader(header: string): string {
  return header
    .replace(/[µμ]/g, "u")
    .normalize("NFKD")
    .replace(/\p{M}/gu, "")
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, " ")
    .trim();
}

/** Unit words a header may carry, e.g. "Copper (ppm)" or "Temp F". */
const UNIT_WORDS: Array<{ pattern: RegExp; unit: ColumnUnit }> = [
  { pattern: /\b(deg ?f|degrees? f|fahrenheit|f)$/, unit: "degF" },
  { pattern: /\b(deg ?c|degrees? c|celsius|c)$/, unit: "degC" },
  { pattern: /\b(ug ?l|ug per l|micrograms? per l(itre|iter)?|ppb)$/, unit: "ugL" },
  { pattern: /\b(mg ?l|mg per l|ppm)$/, unit: "mgL" },
];

/** Spellings of each field, after normaliseHeader and after the unit words are cut off. */
const SPELLINGS: Array<{ field: Exclude<ColumnTarget, "ignore">; names: string[] }> = [
  { field: "accountCode", names: ["account", "account code", "account no", "account number", "acct", "acct no", "acct code", "code", "customer code", "customer id", "pool id", "pool code", "site id", "site code"] },
  { field: "address", names: ["address", "street", "street address", "service address", "site address", "pool address", "location"] },
  { field: "customerName", names: ["customer", "customer name", "client", "client name", "name", "owner", "owner name"] },
  { field: "neighbourhood", names: ["neighbourhood", "neighborhood", "area", "district", "suburb"] },
  { field: "postalCode", names: ["postal code", "postcode", "post code", "zip", "zip code"] },
  { field: "sampledAt", names: ["date", "sample date", "sampled", "sampled at", "sampled on", "test date", "tested", "tested on", "visit date", "service date", "date time", "datetime", "timestamp", "when"] },
  { field: "sampleTime", names: ["time", "sample time", "test time", "visit time"] },
  { field: "note", names: ["note", "notes", "comment", "comments", "remarks", "observations"] },
  { field: "product", names: ["product", "treatment", "treatment product", "chemical", "chemical added", "product used", "dosed"] },
  { field: "amount", names: ["amount", "qty", "quantity", "dose", "dose amount", "treatment amount", "amount added"] },
  { field: "amountUnit", names: ["unit", "units", "uom", "dose unit", "amount unit", "treatment unit"] },
  { field: "cost", names: ["cost", "price", "treatment cost", "charge"] },
  { field: "freeChlorine", names: ["fc", "free cl", "free chlorine", "free cl2", "chlorine free", "free", "cl free", "free available chlorine", "fac"] },
  { field: "combinedChlorine", names: ["cc", "combined cl", "combined chlorine", "chloramines", "combined"] },
  { field: "ph", names: ["ph", "p h", "ph level"] },
  { field: "totalAlkalinity", names: ["ta", "alk", "alkalinity", "total alk", "total alkalinity", "t alk"] },
  { field: "calciumHardness", names: ["ch", "ca", "hardness", "calcium", "calcium hardness", "cal hardness", "ca hardness", "hard"] },
  { field: "cyanuricAcid", names: ["cya", "cyanuric", "cyanuric acid", "stabiliser", "stabilizer", "stab", "conditioner"] },
  { field: "salt", names: ["salt", "salinity", "nacl"] },
  { field: "tds", names: ["tds", "total dissolved solids", "dissolved solids"] },
  { field: "temperatureC", names: ["temp", "temperature", "water temp", "water temperature", "t"] },
  { field: "copper", names: ["cu", "copper", "copper level", "cu level"] },
  { field: "iron", names: ["fe", "iron", "iron level", "fe level"] },
  { field: "manganese", names: ["mn", "manganese", "manganese level", "mn level"] },
];

const FIELD_BY_NAME = new Map<string, Exclude<ColumnTarget, "ignore">>(
  SPELLINGS.flatMap(({ field, names }) => names.map((name) => [name, field] as const)),
);

/**
 * Short forms that route sheets and old logs use, word by word (common
 * practice of the trade's paperwork). Each is read as the word it stands for.
 */
const ABBREVIATIONS: Record<string, string> = {
  dt: "date", dte: "date", svc: "service", serv: "service", srv: "service", vst: "visit", vis: "visit",
  tst: "test", smpl: "sample", chem: "chemical", chems: "chemical", chm: "chemical", prod: "product",
  trtmt: "treatment", trt: "treatment", tx: "treatment", qty: "quantity", qnty: "quantity", amt: "amount",
  temp: "temperature", tmp: "temperature", wtr: "water", stab: "stabiliser", stabl: "stabiliser",
  hard: "hardness", hrd: "hardness", hardn: "hardness", calc: "calcium", alk: "alkalinity", alky: "alkalinity",
  tot: "total", ttl: "total", acct: "account", acc: "account", cust: "customer", clnt: "client",
  addr: "address", adr: "address", st: "street", nbhd: "neighbourhood", hood: "neighbourhood",
  cmt: "comment", cmts: "comments", rmk: "remarks", cyan: "cyanuric", chl: "chlorine", chlor: "chlorine",
  cl: "chlorine", comb: "combined", sal: "salt", mang: "manganese", cop: "copper", no: "number", num: "number",
};

/** Words too general to name a field on their own when only part of a header is recognised. */
const TOO_GENERAL = new Set([
  "name", "code", "number", "id", "free", "combined", "unit", "units", "when", "time", "t", "area", "location",
  "owner", "client", "customer", "total", "level", "added", "used", "water", "service", "visit", "test", "sample",
  "amount", "f", "c", "p", "h",
]);

/** How a proposal was reached: the header's exact words, its words once abbreviations are read, or some of its words. */
export type HeaderConfidence = "exact" | "abbreviation" | "partial";

export type HeaderReading = { field: ColumnTarget; unit?: ColumnUnit; confidence?: HeaderConfidence };

function expandAbbreviations(words: string): string {
  return words
    .split(" ")
    .map((word) => ABBREVIATIONS[word] ?? word)
    .join(" ");
}

/** The field whose spelling is a whole header, or the header less a trailing unit word. */
function readWhole(words: string): HeaderReading | null {
  const whole = FIELD_BY_NAME.get(words);
  if (whole) return { field: whole };
  for (const { pattern, unit } of UNIT_WORDS) {
    const match = pattern.exec(words);
    if (!match) continue;
    const rest = words.slice(0, match.index).trim();
    const field = FIELD_BY_NAME.get(rest);
    if (field && unitsFor(field).includes(unit)) return { field, unit };
    // "ppm" after a field with no unit choice (e.g. "Free Cl ppm") still names the field.
    if (field && unitsFor(field).length === 0 && unit === "mgL") return { field };
  }
  return null;
}

/**
 * The longest spelling all of whose words stand in the header ("Last visit
 * date" holds "visit date"); a spelling of one general word does not count.
 */
function readPart(words: string): HeaderReading | null {
  const present = new Set(words.split(" "));
  let best: { field: Exclude<ColumnTarget, "ignore">; length: number } | null = null;
  for (const [name, field] of FIELD_BY_NAME) {
    const parts = name.split(" ");
    if (parts.length === 1 && TOO_GENERAL.has(name)) continue;
    if (!parts.every((part) => present.has(part))) continue;
    if (!best || parts.length > best.length) best = { field, length: parts.length };
  }
  return best ? { field: best.field } : null;
}

/** Reads one header: the field it names, any unit it states, and how sure the reading is. */
export function readHeader(header: string): HeaderReading {
  const words = normaliseHeader(header);
  const exact = readWhole(words);
  if (exact) return { ...exact, confidence: "exact" };
  const expanded = expandAbbreviations(words);
  const abbreviated = expanded === words ? null : readWhole(expanded);
  if (abbreviated) return { ...abbreviated, confidence: "abbreviation" };
  const part = readPart(expanded);
  if (part) return { ...part, confidence: "partial" };
  return { field: "ignore" };
}

/** A saved mapping: normalised header -> how it is read. */
export type SavedMapping = Record<string, ColumnMapping>;

/**
 * Proposes how to read each column. A field is given to its first column only;
 * later columns with the same meaning are left out, so nothing is read twice.
 */
export function proposeMapping(headers: readonly string[], saved?: SavedMapping): ColumnMapping[] {
  const taken = new Set<ColumnTarget>();
  return headers.map((header) => {
    const fromSaved = saved?.[normaliseHeader(header)];
    const reading = fromSaved ?? readHeader(header);
    if (reading.field === "ignore" || taken.has(reading.field)) return { field: "ignore" };
    taken.add(reading.field);
    return reading.unit ? { field: reading.field, unit: reading.unit } : { field: reading.field };
  });
}

/** True when a saved mapping names every header of the file. */
export function savedMappingFits(headers: readonly string[], saved: SavedMapping): boolean {
  return headers.every((header) => normaliseHeader(header) in saved || header.trim() === "");
}

export function toSavedMapping(headers: readonly string[], columns: readonly ColumnMapping[]): SavedMapping {
  const saved: SavedMapping = {};
  headers.forEach((header, index) => {
    const key = normaliseHeader(header);
    const column = columns[index];
    if (key && column) saved[key] = column;
  });
  return saved;
}
