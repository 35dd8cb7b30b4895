// The demo route book: company, people, routes, fill sources, pools and their
// equipment, plus the hidden per-pool traits (causes) that drive the water
// history simulation.
import type {
  companies,
  equipment,
  fillSources,
  importBatches,
  memberships,
  pools,
  products,
  routes,
  routeTechnicians,
  sourceTests,
  user,
} from "../../app/.server/db/schema";
import { dayNumber, isoDay, yearsBefore } from "./calendar";
import {
  COMPANY,
  DEMO_EMAIL_DOMAIN,
  DEMO_USERS,
  FIRST_NAMES,
  LAST_NAMES,
  NEIGHBOURHOODS,
  ROUTE_TECHNICIAN,
  ROUTES,
  STREETS,
  type DemoUserKey,
  type NeighbourhoodKey,
  type RouteKey,
} from "./names";
import { PRODUCTS, type ProductKey } from "./products";
import { hexFromLabel, Random } from "./random";

export type ScenarioOptions = {
  seed: number;
  pools: number;
  years: number;
  /** Last day of the history, "YYYY-MM-DD". */
  endDate: string;
};

/** First id to use per table, so rows can reference each other before insert. */
export type IdBase = {
  company: number;
  membership: number;
  route: number;
  fillSource: number;
  sourceTest: number;
  pool: number;
  equipment: number;
  product: number;
  importBatch: number;
  waterTest: number;
  treatment: number;
};

export const FRESH_IDS: IdBase = {
  company: 1,
  membership: 1,
  route: 1,
  fillSource: 1,
  sourceTest: 1,
  pool: 1,
  equipment: 1,
  product: 1,
  importBatch: 1,
  waterTest: 1,
  treatment: 1,
};

export type DemoUser = {
  key: DemoUserKey;
  id: string;
  name: string;
  email: string;
  password: string;
  role: (typeof DEMO_USERS)[number]["role"];
};

export type SourceKind = "municipal" | "shared_well" | "private_well";

/** Typical metal content of a fill source, mg/L; the pools draw from it at every top-up. */
export type SourceProfile = {
  id: number;
  name: string;
  kind: SourceKind;
  copper: number;
  iron: number;
  manganese: number;
};

export type ExchangerMetal = "copper" | "cupronickel" | "titanium" | "none" | "unknown";

export type HeaterProfile = {
  kind: "heater" | "heat_pump";
  exchangerMetal: ExchangerMetal;
  installedDay: number;
  removedDay: number | null;
};

export type PoolProfile = {
  id: number;
  index: number;
  accountCode: string;
  routeKey: RouteKey;
  technicianId: string;
  weekday: number;
  /** Local time of the weekly visit, seconds after midnight. */
  visitSecond: number;
  source: SourceProfile;
  sanitiser: "chlorine" | "salt_generator" | "mineral_assist" | "other";
  surface: "plaster" | "pebble" | "quartz" | "vinyl" | "fibreglass" | "tile";
  volumeGallons: number;
  heaters: HeaterProfile[];
  hasIoniser: boolean;
  usesCopperAlgaecide: boolean;
  /** Weekly chance that the water turns aggressive (low pH, low alkalinity) for a while. */
  corrosiveSpellRate: number;
  /** Multiplies the chance of large top-ups (backwash, splash-out, a running autofill). */
  topUpRate: number;
  /** A stain that forms here sets into the finish and keeps feeding metal back until acid-washed. */
  stainSetsIn: boolean;
  /** Share of visits on which the heater runs in spring and autumn. */
  heaterUse: number;
  firstDay: number;
  lastDay: number;
  phDriftPerWeek: number;
  alkalinityBase: number;
  hardnessBase: number;
  cyanuricBase: number;
  saltBase: number;
};

export type RouteBook = {
  options: ScenarioOptions;
  ids: IdBase;
  startDay: number;
  endDay: number;
  timeZone: string;
  company: typeof companies.$inferInsert & { id: number };
  users: DemoUser[];
  userRows: (typeof user.$inferInsert)[];
  memberships: (typeof memberships.$inferInsert)[];
  routes: (typeof routes.$inferInsert)[];
  routeTechnicians: (typeof routeTechnicians.$inferInsert)[];
  fillSources: (typeof fillSources.$inferInsert)[];
  sourceTests: (typeof sourceTests.$inferInsert)[];
  pools: (typeof pools.$inferInsert)[];
  equipment: (typeof equipment.$inferInsert)[];
  products: (typeof products.$inferInsert)[];
  productIds: Record<ProductKey, number>;
  importBatch: typeof importBatches.$inferInsert & { id: number };
  /** Tests sampled before this day belong to the historical spreadsheet upload. */
  importedBeforeDay: number;
  profiles: PoolProfile[];
};

const YEAR_DAYS = 365.25;

type Segment = "ironWell" | "cleanWell" | "privateWell" | "municipal";

const NEIGHBOURHOOD_ROUTE: Record<NeighbourhoodKey, RouteKey> = {
  oldMill: "north",
  lakeside: "north",
  birchHollow: "river",
  sawyersBend: "river",
  quarryHeights: "hills",
};

function segmentSizes(poolCount: number): Record<Segment, number> {
  const ironWell = Math.max(3, Math.round(poolCount * 0.1));
  const cleanWell = Math.max(3, Math.round(poolCount * 0.08));
  const privateWell = Math.max(4, Math.round(poolCount * 0.1));
  return { ironWell, cleanWell, privateWell, municipal: Math.max(0, poolCount - ironWell - cleanWell - privateWell) };
}

export function buildRouteBook(options: ScenarioOptions, ids: IdBase = FRESH_IDS): RouteBook {
  const rng = new Random(options.seed);
  const endDay = dayNumber(options.endDate);
  const startDay = dayNumber(yearsBefore(options.endDate, options.years)) + 1;
  const companyId = ids.company;
  const spanDays = endDay - startDay;

  const company = {
    id: companyId,
    name: COMPANY.name,
    town: COMPANY.town,
    timeZone: COMPANY.timeZone,
    unitSystem: "us" as const,
    settings: {},
    createdAt: new Date((startDay - 30) * 86_400_000),
  };

  const users: DemoUser[] = DEMO_USERS.map((u) => ({
    key: u.key,
    id: hexFromLabel(`user:${options.seed}:${u.key}`, 32),
    name: u.name,
    email: `${u.email}@${DEMO_EMAIL_DOMAIN}`,
    password: u.password,
    role: u.role,
  }));
  const userId = (key: DemoUserKey) => users.find((u) => u.key === key)!.id;
  const userRows = users.map((u) => ({ id: u.id, name: u.name, email: u.email, emailVerified: true }));
  const membershipRows = users.map((u, i) => ({ id: ids.membership + i, companyId, userId: u.id, role: u.role }));

  const routeIds = Object.fromEntries(ROUTES.map((r, i) => [r.key, ids.route + i])) as Record<RouteKey, number>;
  const routeRows = ROUTES.map((r) => ({ id: routeIds[r.key], companyId, name: r.name, serviceWeekdays: r.serviceWeekdays }));
  const routeTechnicianRows = ROUTES.map((r) => ({ routeId: routeIds[r.key], userId: userId(ROUTE_TECHNICIAN[r.key]) }));

  const productIds = Object.fromEntries(PRODUCTS.map((p, i) => [p.key, ids.product + i])) as Record<ProductKey, number>;
  const productRows = PRODUCTS.map((p) => ({
    id: productIds[p.key],
    companyId,
    name: p.name,
    category: p.category,
    labelDose: p.labelDose,
    maintenanceDose: p.maintenanceDose ?? null,
    doseUnit: p.doseUnit,
    doseBasis: "per_10k_gal" as const,
    unitCost: p.unitCost,
  }));

  // Fill sources: one municipal supply, two shared wells (the first carries
  // iron), and one private well per well-fed house.
  const sizes = segmentSizes(options.pools);
  let nextSourceId = ids.fillSource;
  const municipal: SourceProfile = { id: nextSourceId++, name: `${COMPANY.town} municipal supply`, kind: "municipal", copper: 0.03, iron: 0.02, manganese: 0.005 };
  const ironWell: SourceProfile = { id: nextSourceId++, name: "Quarry Heights shared well", kind: "shared_well", copper: 0.01, iron: 0.55, manganese: 0.02 };
  const cleanWell: SourceProfile = { id: nextSourceId++, name: "Sawyers Bend shared well", kind: "shared_well", copper: 0.01, iron: 0.04, manganese: 0.01 };
  const sources: SourceProfile[] = [municipal, ironWell, cleanWell];

  const segments: Segment[] = [
    ...Array<Segment>(sizes.ironWell).fill("ironWell"),
    ...Array<Segment>(sizes.cleanWell).fill("cleanWell"),
    ...Array<Segment>(sizes.privateWell).fill("privateWell"),
    ...Array<Segment>(sizes.municipal).fill("municipal"),
  ];
  const shuffled = rng.fork("segments").shuffle(segments);

  const poolRows: RouteBook["pools"] = [];
  const equipmentRows: RouteBook["equipment"] = [];
  const profiles: PoolProfile[] = [];
  let nextEquipmentId = ids.equipment;
  let privateWellCount = 0;
  const stopsPerRouteDay = new Map<string, number>();
  const usedAddresses = new Set<string>();

  shuffled.forEach((segment, index) => {
    const prng = rng.fork(`pool:${index}`);
    const poolId = ids.pool + index;
    const accountCode = `${COMPANY.accountPrefix}-${String(index + 1).padStart(4, "0")}`;

    let neighbourhood: NeighbourhoodKey;
    let source: SourceProfile;
    if (segment === "ironWell") {
      neighbourhood = "quarryHeights";
      source = ironWell;
    } else if (segment === "cleanWell") {
      neighbourhood = "sawyersBend";
      source = cleanWell;
    } else if (segment === "privateWell") {
      neighbourhood = privateWellCount % 2 === 0 ? "sawyersBend" : "quarryHeights";
      source = privateWellSource(prng, nextSourceId++, privateWellCount++);
      sources.push(source);
    } else {
      neighbourhood = prng.weighted<NeighbourhoodKey>([["oldMill", 30], ["lakeside", 28], ["birchHollow", 30], ["quarryHeights", 12]]);
      source = municipal;
    }
    const routeKey = NEIGHBOURHOOD_ROUTE[neighbourhood];
    const route = ROUTES.find((r) => r.key === routeKey)!;
    const weekdays = route.serviceWeekdays.split(",").map(Number);
    const weekday = weekdays[index % weekdays.length]!;
    const routeDay = `${routeKey}:${weekday}`;
    const stop = stopsPerRouteDay.get(routeDay) ?? 0;
    stopsPerRouteDay.set(routeDay, stop + 1);
    // Stops run from 08:00, about 22 minutes apart, wrapping within a 9-hour day.
    const visitSecond = 8 * 3600 + ((stop * 1320) % (9 * 3600)) + prng.int(0, 240);

    const street = prng.pick(STREETS[neighbourhood]);
    let houseNumber = prng.int(2, 240);
    while (usedAddresses.has(`${houseNumber} ${street}`)) houseNumber = prng.int(2, 240 + usedAddresses.size);
    usedAddresses.add(`${houseNumber} ${street}`);
    // A private well is named after the house it serves.
    if (source.kind === "private_well") source.name = `Private well, ${houseNumber} ${street}`;
    const first = prng.pick(FIRST_NAMES);
    const last = prng.pick(LAST_NAMES);

    const sanitiser = prng.weighted<PoolProfile["sanitiser"]>([["chlorine", 62], ["salt_generator", 31], ["mineral_assist", 5], ["other", 2]]);
    const surface = prng.weighted<PoolProfile["surface"]>([["plaster", 42], ["pebble", 16], ["quartz", 12], ["vinyl", 16], ["fibreglass", 11], ["tile", 3]]);
    const commercial = prng.chance(0.05);
    const volumeGallons = Math.round((commercial ? prng.uniform(45_000, 80_000) : prng.uniform(12_000, 34_000)) / 500) * 500;

    // Pools join and leave the book over the years, so observation time varies.
    const joinsLate = prng.chance(0.08);
    const firstDay = joinsLate ? startDay + prng.int(60, Math.max(61, spanDays - 120)) : startDay;
    const leaves = prng.chance(0.03);
    const lastDay = leaves ? prng.int(firstDay + 90, Math.max(firstDay + 91, endDay)) : endDay;

    const equipmentFor = (kind: "heater" | "heat_pump" | "salt_cell" | "pump" | "filter" | "ioniser", spec: {
      exchangerMetal?: ExchangerMetal | null;
      description: string;
      installedDay: number;
      removedDay?: number | null;
    }) => {
      equipmentRows.push({
        id: nextEquipmentId++,
        companyId,
        poolId,
        kind,
        exchangerMetal: spec.exchangerMetal ?? null,
        description: spec.description,
        installedOn: isoDay(spec.installedDay),
        removedOn: spec.removedDay == null ? null : isoDay(spec.removedDay),
      });
    };

    const heaters = heaterTimeline(prng, startDay, endDay);
    for (const heater of heaters) {
      equipmentFor(heater.kind, {
        exchangerMetal: heater.exchangerMetal,
        description: heater.kind === "heater" ? `Gas heater, ${heater.exchangerMetal} exchanger` : "Heat pump, titanium-tube exchanger",
        installedDay: heater.installedDay,
        removedDay: heater.removedDay,
      });
    }

    const pumpInstalled = startDay - Math.round(prng.uniform(0, 12) * YEAR_DAYS);
    const pumpReplaced = prng.chance(0.12) ? prng.int(startDay + 30, endDay - 30) : null;
    equipmentFor("pump", { description: "Single-speed pump, 1.5 hp", installedDay: pumpInstalled, removedDay: pumpReplaced });
    if (pumpReplaced) equipmentFor("pump", { description: "Variable-speed pump", installedDay: pumpReplaced });
    equipmentFor("filter", {
      description: prng.pick(["Sand filter", "Cartridge filter", "Diatomaceous earth filter"]),
      installedDay: startDay - Math.round(prng.uniform(0, 15) * YEAR_DAYS),
    });

    if (sanitiser === "salt_generator") {
      let installed = startDay - Math.round(prng.uniform(0, 4) * YEAR_DAYS);
      while (installed <= endDay) {
        const wornOut = installed + Math.round(prng.uniform(4, 5.5) * YEAR_DAYS);
        equipmentFor("salt_cell", { exchangerMetal: null, description: "Salt cell", installedDay: installed, removedDay: wornOut <= endDay ? wornOut : null });
        installed = wornOut;
      }
    }
    const hasIoniser = sanitiser === "mineral_assist";
    if (hasIoniser) {
      equipmentFor("ioniser", { description: "Copper-silver ioniser", installedDay: startDay - Math.round(prng.uniform(1, 6) * YEAR_DAYS) });
    }

    const oldCopperHeater = heaters.some((h) => h.exchangerMetal === "copper" || h.exchangerMetal === "cupronickel");
    const profile: PoolProfile = {
      id: poolId,
      index,
      accountCode,
      routeKey,
      technicianId: userId(ROUTE_TECHNICIAN[routeKey]),
      weekday,
      visitSecond,
      source,
      sanitiser,
      surface,
      volumeGallons,
      heaters,
      hasIoniser,
      usesCopperAlgaecide: sanitiser === "chlorine" && prng.chance(0.09),
      corrosiveSpellRate: prng.chance(0.2) ? prng.uniform(0.04, 0.08) : prng.uniform(0.01, 0.03),
      topUpRate: prng.chance(0.1) ? prng.uniform(1.8, 3) : prng.uniform(0.6, 1.3),
      stainSetsIn: false,
      heaterUse: prng.uniform(0.4, 0.9) * (commercial ? 1.3 : 1),
      firstDay,
      lastDay,
      phDriftPerWeek: sanitiser === "salt_generator" ? prng.uniform(0.08, 0.16) : prng.uniform(0.03, 0.09),
      alkalinityBase: prng.uniform(70, 125),
      hardnessBase: surface === "vinyl" || surface === "fibreglass" ? prng.uniform(150, 260) : prng.uniform(220, 400),
      cyanuricBase: sanitiser === "salt_generator" ? prng.uniform(50, 80) : prng.uniform(25, 60),
      saltBase: prng.uniform(2950, 3450),
    };
    // Set-in stains need a porous finish and a cause that keeps coming back.
    const porous = surface === "plaster" || surface === "pebble" || surface === "quartz";
    if (porous && (segment === "ironWell" || oldCopperHeater) && prng.chance(0.18)) profile.stainSetsIn = true;
    profiles.push(profile);

    poolRows.push({
      id: poolId,
      companyId,
      routeId: routeIds[routeKey],
      fillSourceId: source.id,
      accountCode,
      customerName: `${first} ${last}`,
      customerPhone: `555-01${String(prng.int(0, 99)).padStart(2, "0")}`,
      customerEmail: `${first}.${last}.${index + 1}@mail.example`.toLowerCase(),
      street: `${houseNumber} ${street}`,
      neighbourhood: NEIGHBOURHOODS[neighbourhood].name,
      postalCode: NEIGHBOURHOODS[neighbourhood].postalCode,
      volumeLitres: Math.round(volumeGallons * 3.785411784),
      surface,
      sanitiser,
      active: lastDay >= endDay,
      createdAt: new Date(firstDay * 86_400_000),
    });
  });

  const fillSourceRows = sources.map((s) => ({
    id: s.id,
    companyId,
    name: s.name,
    kind: s.kind,
    notes: s === ironWell ? "Shared well; owners report orange staining after refills." : null,
  }));

  const sourceTestRows = buildSourceTests(rng.fork("source-tests"), sources, { municipal, ironWell, cleanWell }, startDay, endDay, companyId, ids.sourceTest);

  const importedBeforeDay = startDay + 365;
  const importBatch = {
    id: ids.importBatch,
    companyId,
    userId: userId("analyst"),
    fileName: "route-log-first-year.csv",
    fileSha256: hexFromLabel(`import:${options.seed}`, 64),
    status: "committed" as const,
    createdAt: new Date((importedBeforeDay + 20) * 86_400_000),
  };

  return {
    options,
    ids,
    startDay,
    endDay,
    timeZone: COMPANY.timeZone,
    company,
    users,
    userRows,
    memberships: membershipRows,
    routes: routeRows,
    routeTechnicians: routeTechnicianRows,
    fillSources: fillSourceRows,
    sourceTests: sourceTestRows,
    pools: poolRows,
    equipment: equipmentRows,
    products: productRows,
    productIds,
    importBatch,
    importedBeforeDay,
    profiles,
  };
}

/** Private wells: most clean, some with a little manganese, some with a little iron. */
function privateWellSource(rng: Random, id: number, ordinal: number): SourceProfile {
  const character = ordinal % 6;
  const base: SourceProfile = { id, name: "", kind: "private_well", copper: 0.01, iron: rng.uniform(0.01, 0.05), manganese: rng.uniform(0.002, 0.01) };
  if (character === 0) return { ...base, manganese: rng.uniform(0.12, 0.25) };
  if (character === 3) return { ...base, iron: rng.uniform(0.2, 0.35) };
  return base;
}

/**
 * Heaters are installed at ages up to 22 years; older ones carry copper or
 * cupronickel exchangers, newer ones mostly titanium. Some old heaters are
 * replaced during the history, which should end their copper.
 */
function heaterTimeline(rng: Random, startDay: number, endDay: number): HeaterProfile[] {
  const roll = rng.next();
  if (roll < 0.14) {
    return [{ kind: "heat_pump", exchangerMetal: rng.chance(0.85) ? "titanium" : "cupronickel", installedDay: endDay - Math.round(rng.uniform(1, 9) * YEAR_DAYS), removedDay: null }];
  }
  if (roll > 0.48) return [];
  const ageAtEnd = rng.uniform(1, 22);
  const installedDay = endDay - Math.round(ageAtEnd * YEAR_DAYS);
  const old = ageAtEnd >= 11;
  const exchangerMetal: ExchangerMetal = old
    ? rng.chance(0.55) ? "copper" : "cupronickel"
    : rng.weighted<ExchangerMetal>([["titanium", 75], ["cupronickel", 15], ["unknown", 10]]);
  const ageAtStart = (startDay - installedDay) / YEAR_DAYS;
  if (old && ageAtStart >= 10 && rng.chance(0.35)) {
    const span = endDay - startDay;
    const replacedDay = startDay + Math.round(span * rng.uniform(0.3, 0.85));
    return [
      { kind: "heater", exchangerMetal, installedDay, removedDay: replacedDay },
      { kind: "heater", exchangerMetal: "titanium", installedDay: replacedDay, removedDay: null },
    ];
  }
  return [{ kind: "heater", exchangerMetal, installedDay, removedDay: null }];
}

function buildSourceTests(
  rng: Random,
  sources: SourceProfile[],
  named: { municipal: SourceProfile; ironWell: SourceProfile; cleanWell: SourceProfile },
  startDay: number,
  endDay: number,
  companyId: number,
  firstId: number,
): RouteBook["sourceTests"] {
  const rows: RouteBook["sourceTests"] = [];
  const reading = (value: number, detectionLimit: number) =>
    value < detectionLimit ? { value: detectionLimit, below: true } : { value: Math.round(value * 1000) / 1000, below: false };
  const add = (source: SourceProfile, day: number, note: string | null) => {
    const copper = reading(source.copper * rng.uniform(0.7, 1.3), 0.05);
    // Iron in the shared well swings with the water table: 0.3 to 0.8 mg/L.
    const ironSwing = source === named.ironWell ? rng.uniform(0.3, 0.8) : source.iron * rng.uniform(0.7, 1.3);
    const iron = reading(ironSwing, 0.05);
    const manganese = reading(source.manganese * rng.uniform(0.7, 1.3), 0.02);
    rows.push({
      id: firstId + rows.length,
      companyId,
      fillSourceId: source.id,
      sampledOn: isoDay(day),
      copper: copper.value,
      copperBelowDetection: copper.below,
      iron: iron.value,
      ironBelowDetection: iron.below,
      manganese: manganese.value,
      manganeseBelowDetection: manganese.below,
      note,
    });
  };
  for (let day = startDay + 20; day <= endDay; day += 365) add(named.municipal, day, "Annual supply report");
  for (let day = startDay + 45; day <= endDay; day += 91) add(named.ironWell, day, "Quarterly well sample");
  for (let day = startDay + 60; day <= endDay; day += 365) add(named.cleanWell, day, "Annual well sample");
  for (const source of sources) {
    if (source.kind !== "private_well") continue;
    // Not every well owner has had the water tested.
    if (rng.chance(0.7)) add(source, startDay + rng.int(0, endDay - startDay), "Owner's lab report");
  }
  return rows;
}
