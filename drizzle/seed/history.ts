// Simulates one pool's water, week by week, and records what the technician
// measured and did. Metals only appear through causes (fill water, an ageing
// copper exchanger in aggressive water, copper algaecide, an ioniser, a stain
// set into the finish), so the analytics have something real to find.
import type { treatments, waterTests } from "../../app/.server/db/schema";
import { dayOfYear, isoWeekday, type LocalClock, monthOf } from "./calendar";
import { saturationIndex, seasonalTemperature, summerness } from "./chemistry";
import { COLLECTOR_PAD_EFFECT, COPPER_PER_ALGAECIDE_DOSE, PRODUCTS, SEQUESTRANT_EFFECT, type ProductKey } from "./products";
import type { Random } from "./random";
import type { HeaterProfile, PoolProfile, RouteBook } from "./routebook";

export type WaterTestRow = typeof waterTests.$inferInsert & { id: number };
export type TreatmentRow = typeof treatments.$inferInsert & { id: number };
export type PoolHistory = { waterTests: WaterTestRow[]; treatments: TreatmentRow[] };

/** Next ids to hand out; shared across pools so ids stay unique and ordered. */
export type IdCounter = { waterTest: number; treatment: number };

type Metal = "copper" | "iron" | "manganese";
const METALS: readonly Metal[] = ["copper", "iron", "manganese"];
type Levels = Record<Metal, number>;

// Common-practice thresholds the technician reacts to, mg/L.
const ELEVATED: Levels = { copper: 0.3, iron: 0.2, manganese: 0.05 };
const CLEAR: Levels = { copper: 0.1, iron: 0.1, manganese: 0.02 };
const DETECTION_LIMIT: Levels = { copper: 0.05, iron: 0.05, manganese: 0.02 };
/** Level above which an unprotected finish starts to stain. */
const STAINING_LEVEL: Levels = { copper: 0.35, iron: 0.22, manganese: 0.06 };
/** Daily share of each metal lost by oxidation, filtration and backwash. */
const NATURAL_LOSS_PER_DAY: Levels = { copper: 0.012, iron: 0.02, manganese: 0.015 };
/** Metal fed back each day by a stain set into a porous finish. */
const SET_IN_RELEASE_PER_DAY: Levels = { copper: 0.012, iron: 0.015, manganese: 0.004 };
const STAIN_COLOUR = { copper: "blue_green", iron: "red_brown", manganese: "black_brown" } as const;
/** Copper released per day by a fully aged copper exchanger per unit of corrosivity. */
const EXCHANGER_RELEASE_PER_DAY = 0.07;

type MetalStrategy = "heavyWithPad" | "maintenanceWithPad" | "heavyOnly" | "maintenanceOnly" | "padOnly";
const STRATEGIES: readonly (readonly [MetalStrategy, number])[] = [
  ["heavyWithPad", 28],
  ["maintenanceWithPad", 16],
  ["heavyOnly", 17],
  ["maintenanceOnly", 23],
  ["padOnly", 16],
];

const ROUTINE_NOTES = [
  "Leaves in skimmer basket",
  "Cover on; water clear",
  "Filter pressure high; backwashed",
  "Owner away this week",
  "Heavy pollen on the surface",
  "Cleaner left in the pool; removed",
  "Water slightly cloudy",
  "Pump basket lid cracked; owner told",
];

type Stain = { metal: Metal; fresh: boolean; setIn: boolean; sinceDay: number; washDay: number | null; escalated: boolean };
type Sequestrant = { level: number; removalPerDay: number; decayPerDay: number; phFactor: number };
type Pad = { fittedDay: number; loaded: number };

const round = (value: number, step: number) => Math.round(value / step) * step;
const fixed = (value: number, decimals: number) => Number(value.toFixed(decimals));
const clamp = (value: number, low: number, high: number) => Math.min(high, Math.max(low, value));

export function simulatePoolHistory(book: RouteBook, profile: PoolProfile, rng: Random, ids: IdCounter, clock: LocalClock): PoolHistory {
  return new PoolSimulation(book, profile, rng, ids, clock).run();
}

class PoolSimulation {
  private readonly tests: WaterTestRow[] = [];
  private readonly applied: TreatmentRow[] = [];

  private simulatedThrough: number;
  private chemistryDay: number;
  private ph = 7.5;
  private alkalinity: number;
  private hardness: number;
  private cyanuric: number;
  private salt: number;
  private freeChlorine = 3;
  private temperature = 20;
  private spellWeeksLeft = 0;
  private heaterOn = false;
  private corrosivity = 0;
  private ioniserOutput = 1;
  private usesCopperAlgaecide: boolean;
  private nextAlgaecideDay = 0;
  private readonly metals: Levels;
  private sequestrant: Sequestrant | null = null;
  private pad: Pad | null = null;
  private stain: Stain | null = null;
  /** What the technician believes: an elevated reading not yet followed by a clear one. */
  private readonly watching: Record<Metal, boolean> = { copper: false, iron: false, manganese: false };
  private lastMetalTreatmentDay: number | null = null;
  private retestDay: number | null = null;
  private pendingNotes: string[] = [];
  private toppedUp = false;
  private lastHeater: HeaterProfile | null = null;

  constructor(
    private readonly book: RouteBook,
    private readonly pool: PoolProfile,
    private readonly rng: Random,
    private readonly ids: IdCounter,
    private readonly clock: LocalClock,
  ) {
    this.simulatedThrough = pool.firstDay - 1;
    this.chemistryDay = pool.firstDay - 7;
    this.alkalinity = pool.alkalinityBase;
    this.hardness = pool.hardnessBase;
    this.cyanuric = pool.cyanuricBase;
    this.salt = pool.sanitiser === "salt_generator" ? pool.saltBase : 0;
    this.usesCopperAlgaecide = pool.usesCopperAlgaecide;
    this.metals = { copper: 0.02, iron: pool.source.iron * 0.3, manganese: pool.source.manganese * 0.3 };
    this.lastHeater = this.activeHeater(pool.firstDay);
  }

  run(): PoolHistory {
    let day = this.pool.firstDay;
    while (isoWeekday(day) !== this.pool.weekday) day++;
    for (; day <= this.pool.lastDay; day += 7) {
      if (this.skipsVisit(day)) {
        this.advanceTo(day);
        continue;
      }
      this.visit(day, "weekly");
      const retest = this.retestDay;
      this.retestDay = null;
      if (retest !== null && retest < day + 7 && retest <= this.pool.lastDay) this.visit(retest, "retest");
    }
    return { waterTests: this.tests, treatments: this.applied };
  }

  private skipsVisit(day: number): boolean {
    const doy = dayOfYear(day);
    const holidays = doy >= 358 || doy <= 2;
    return this.rng.chance(holidays ? 0.35 : 0.025);
  }

  // --- the water between visits -------------------------------------------

  private advanceTo(day: number) {
    for (let d = this.simulatedThrough + 1; d <= day; d++) this.simulateDay(d);
    this.simulatedThrough = Math.max(this.simulatedThrough, day);
  }

  private simulateDay(day: number) {
    const season = summerness(dayOfYear(day));
    const source = this.pool.source;
    // The iron well runs richer in late summer when the water table drops.
    const sourceIron = source.kind === "shared_well" && source.iron > 0.2 ? source.iron * (0.75 + 0.45 * season) : source.iron;
    const fill: Levels = { copper: source.copper, iron: sourceIron, manganese: source.manganese };

    // Evaporation leaves metals behind and the top-up water brings more in.
    const evaporation = 0.0015 + 0.006 * season;
    for (const metal of METALS) this.metals[metal] += fill[metal] * evaporation;
    if (this.rng.chance((0.004 + 0.03 * season) * this.pool.topUpRate)) {
      const share = this.rng.uniform(0.06, 0.2);
      for (const metal of METALS) this.metals[metal] = this.metals[metal] * (1 - share) + fill[metal] * share;
      this.toppedUp = true;
    }

    this.metals.copper += this.exchangerRelease(day);
    if (this.pool.hasIoniser) this.metals.copper += 0.0028 * (0.6 + 0.8 * season) * this.ioniserOutput;
    if (this.stain?.setIn) this.metals[this.stain.metal] += SET_IN_RELEASE_PER_DAY[this.stain.metal] * (1 + this.corrosivity);

    const sequestrantRemoval = this.sequestrant ? this.sequestrant.removalPerDay * this.sequestrant.level * this.sequestrant.phFactor : 0;
    const padRemoval = this.pad ? COLLECTOR_PAD_EFFECT.removalPerDay * 0.5 ** ((day - this.pad.fittedDay) / COLLECTOR_PAD_EFFECT.halfLifeDays) : 0;
    // A set-in stain gives back much of what the treatment takes out.
    const treatmentGrip = this.stain?.setIn ? 0.4 : 1;
    for (const metal of METALS) {
      const rate = NATURAL_LOSS_PER_DAY[metal] + (sequestrantRemoval + padRemoval) * treatmentGrip;
      const before = this.metals[metal];
      this.metals[metal] = before * Math.exp(-rate);
      if (this.pad) this.pad.loaded += ((before - this.metals[metal]) * padRemoval * treatmentGrip) / rate;
    }
    if (this.sequestrant) {
      this.sequestrant.level *= this.sequestrant.decayPerDay;
      if (this.sequestrant.level < 0.05) this.sequestrant = null;
    }
  }

  /** Copper from a copper or cupronickel exchanger: grows with age and aggressive water, mostly while firing. */
  private exchangerRelease(day: number): number {
    const heater = this.activeHeater(day);
    if (!heater || (heater.exchangerMetal !== "copper" && heater.exchangerMetal !== "cupronickel")) return 0;
    const ageYears = (day - heater.installedDay) / 365.25;
    const wear = clamp((ageYears - 6) / 5, 0, 1.2);
    const alloy = heater.exchangerMetal === "copper" ? 1 : 0.6;
    const chloride = this.pool.sanitiser === "salt_generator" ? 1.4 : 1;
    return EXCHANGER_RELEASE_PER_DAY * wear * alloy * chloride * this.corrosivity * (this.heaterOn ? 1 : 0.08);
  }

  private activeHeater(day: number): HeaterProfile | null {
    return this.pool.heaters.find((h) => h.installedDay <= day && (h.removedDay === null || day < h.removedDay)) ?? null;
  }

  // --- the visit -------------------------------------------------------------

  private visit(day: number, kind: "weekly" | "retest") {
    this.advanceTo(day);
    const weekly = kind === "weekly";
    if (weekly) {
      this.updateChemistry(day);
      this.noteEquipmentChanges(day);
      this.updateStain(day);
    }

    const sampledAt = this.sampleTime(day, kind);
    const test = this.recordTest(day, sampledAt, kind);
    this.act(day, test, sampledAt, weekly);

    if (weekly) {
      this.heaterOn = this.decideHeater(day);
      this.corrosivity = Math.max(0, -0.3 - saturationIndex(this.balance()));
      this.toppedUp = false;
    }
  }

  private balance() {
    const tds = this.salt > 0 ? this.salt + 450 : 350 + this.hardness + 2 * this.cyanuric;
    return { ph: this.ph, totalAlkalinity: this.alkalinity, calciumHardness: this.hardness, cyanuricAcid: this.cyanuric, temperatureC: this.temperature, tds };
  }

  private updateChemistry(day: number) {
    const rng = this.rng;
    const weeks = (day - this.chemistryDay) / 7;
    this.chemistryDay = day;
    const season = summerness(dayOfYear(day));

    const wasInSpell = this.spellWeeksLeft > 0;
    if (wasInSpell) this.spellWeeksLeft -= Math.max(1, Math.round(weeks));
    else if (rng.chance(this.pool.corrosiveSpellRate * (0.6 + 0.8 * season))) {
      this.spellWeeksLeft = rng.int(1, 4);
      if (rng.chance(0.5)) this.pendingNotes.push(rng.pick(["Low pH and alkalinity after heavy rain", "Water aggressive; alkalinity low"]));
    }
    if (this.spellWeeksLeft > 0) {
      this.ph = clamp(rng.normal(6.95, 0.1), 6.7, 7.15);
      this.alkalinity = clamp(rng.normal(52, 7), 35, 68);
    } else if (wasInSpell) {
      this.ph = rng.normal(7.4, 0.08);
      this.alkalinity = rng.normal(this.pool.alkalinityBase * 0.9, 5);
    } else {
      this.ph = clamp(this.ph + this.pool.phDriftPerWeek * weeks + rng.normal(0, 0.07), 7.0, 8.2);
      this.alkalinity = clamp(this.alkalinity + (this.pool.alkalinityBase - this.alkalinity) * 0.35 + rng.normal(0, 4), 50, 150);
    }

    this.hardness += 1.2 * weeks * (0.3 + season) + rng.normal(0, 4);
    const stabiliserGain = this.pool.sanitiser === "salt_generator" ? 0.05 : 0.35;
    this.cyanuric += stabiliserGain * weeks + rng.normal(0, 1.5);
    if (this.hardness > 460 || this.cyanuric > 90 || rng.chance(0.003 * weeks)) this.partialDrain();
    this.hardness = clamp(this.hardness, 120, 480);
    this.cyanuric = clamp(this.cyanuric, 15, 95);

    if (this.salt > 0) this.salt = clamp(this.salt + (this.pool.saltBase - this.salt) * 0.3 + rng.normal(0, 60), 2750, 3650);
    this.freeChlorine = rng.chance(0.04 * season)
      ? rng.uniform(0.2, 0.9)
      : clamp(this.salt > 0 ? rng.normal(2.9, 0.7) : rng.normal(3.1, 1.1), 0.5, 6);
    this.temperature = seasonalTemperature(dayOfYear(day)) + rng.normal(0, 1.2);
    if (this.heaterOn) this.temperature = Math.max(this.temperature, rng.normal(28, 0.8));
  }

  /** Lets a quarter of the water go and refills from the source. */
  private partialDrain() {
    const share = 0.25;
    this.hardness = this.hardness * (1 - share) + 120 * share;
    this.cyanuric *= 1 - share;
    const source = this.pool.source;
    for (const metal of METALS) this.metals[metal] = this.metals[metal] * (1 - share) + source[metal] * share;
    this.pendingNotes.push("Partial drain and refill to bring stabiliser down");
  }

  private noteEquipmentChanges(day: number) {
    const heater = this.activeHeater(day);
    if (heater !== this.lastHeater) {
      if (heater && this.lastHeater) this.pendingNotes.push(`Old heater swapped out; exchanger of the replacement: ${heater.exchangerMetal}`);
      this.lastHeater = heater;
    }
  }

  private updateStain(day: number) {
    const rng = this.rng;
    if (this.stain) {
      this.stain.fresh = false;
      if (this.stain.setIn) {
        if (this.stain.washDay !== null && day >= this.stain.washDay) this.acidWash();
        else if (!this.stain.escalated && day - this.stain.sinceDay > 60) {
          this.stain.escalated = true;
          this.pendingNotes.push("Stain not responding to treatment; recommend surface acid treatment by a contractor");
        }
        return;
      }
      const protectedBySequestrant = (this.sequestrant?.level ?? 0) > 0.3;
      const low = this.metals[this.stain.metal] < CLEAR[this.stain.metal];
      if (low && rng.chance(protectedBySequestrant ? 0.25 : 0.1)) this.stain = null;
      return;
    }
    const ratios = METALS.map((metal) => [metal, this.metals[metal] / STAINING_LEVEL[metal]] as const);
    const [metal, ratio] = ratios.reduce((best, next) => (next[1] > best[1] ? next : best));
    if (ratio < 1) return;
    const finish = { plaster: 1, pebble: 0.9, quartz: 0.9, vinyl: 0.6, fibreglass: 0.5, tile: 0.4 }[this.pool.surface];
    const protection = (this.sequestrant?.level ?? 0) > 0.3 ? 0.3 : 1;
    if (!rng.chance(0.4 * Math.min(1.5, ratio) * finish * protection)) return;
    const setIn = this.pool.stainSetsIn;
    // Some owners put off the acid wash past the end of the history.
    const washDay = setIn ? day + rng.int(150, 560) : null;
    this.stain = { metal, fresh: true, setIn, sinceDay: day, washDay, escalated: false };
  }

  private acidWash() {
    this.stain = null;
    const source = this.pool.source;
    for (const metal of METALS) this.metals[metal] = source[metal];
    this.hardness = 160;
    this.cyanuric = 30;
    this.sequestrant = null;
    this.pad = null;
    this.pendingNotes.push("Drained and acid washed by a contractor; stain gone");
  }

  private decideHeater(day: number): boolean {
    if (!this.activeHeater(day)) return false;
    const month = monthOf(day);
    const shoulder = month === 4 || month === 5 || month === 9 || month === 10;
    const summer = month >= 6 && month <= 8;
    const chance = shoulder ? this.pool.heaterUse : summer ? 0.12 : 0.04;
    return this.rng.chance(Math.min(0.95, chance));
  }

  private sampleTime(day: number, kind: "weekly" | "retest"): Date {
    const rng = this.rng;
    const seconds = kind === "weekly"
      ? this.pool.visitSecond + Math.round(rng.normal(0, 240))
      : rng.int(14 * 3600, 17 * 3600);
    return this.clock.toUtc(day, clamp(seconds, 6 * 3600, 19 * 3600), rng.int(0, 999));
  }

  // --- what the technician records -------------------------------------------

  private recordTest(day: number, sampledAt: Date, kind: "weekly" | "retest"): WaterTestRow {
    const rng = this.rng;
    const weekly = kind === "weekly";
    const metalIndex = Math.max(...METALS.map((metal) => this.metals[metal] / ELEVATED[metal]));
    const blurred = rng.chance(0.04 + 0.55 * Math.min(1, (metalIndex * metalIndex) / 1.5));
    const watchingAny = METALS.some((metal) => this.watching[metal]);
    const recentlyTreated = this.lastMetalTreatmentDay !== null && day - this.lastMetalTreatmentDay <= 30;
    const monthly = new Date(day * 86_400_000).getUTCDate() <= 7;
    const testsMetals =
      !weekly ||
      monthly ||
      (blurred && rng.chance(0.85)) ||
      this.stain?.fresh === true ||
      watchingAny ||
      recentlyTreated ||
      this.pad !== null ||
      rng.chance(0.04);
    const wellWater = this.pool.source.kind !== "municipal";
    const testsManganese =
      testsMetals && (wellWater || this.stain?.metal === "manganese" || this.watching.manganese || rng.chance(0.15));

    const copper = testsMetals ? this.readMetal("copper") : null;
    const iron = testsMetals ? this.readMetal("iron") : null;
    const manganese = testsManganese ? this.readMetal("manganese") : null;
    for (const [metal, reading] of [["copper", copper], ["iron", iron], ["manganese", manganese]] as const) {
      if (!reading) continue;
      if (reading.value >= ELEVATED[metal]) this.watching[metal] = true;
      else if (reading.value < CLEAR[metal] || reading.below) this.watching[metal] = false;
    }

    const note = this.pendingNotes.length > 0 ? this.pendingNotes.join(". ") : weekly && rng.chance(0.03) ? rng.pick(ROUTINE_NOTES) : null;
    this.pendingNotes = [];
    const imported = day < this.book.importedBeforeDay;
    const row: WaterTestRow = {
      id: this.ids.waterTest++,
      companyId: this.book.company.id,
      poolId: this.pool.id,
      sampledAt,
      technicianId: this.pool.technicianId,
      freeChlorine: fixed(clamp(this.freeChlorine + rng.normal(0, 0.15), 0, 10), 1),
      combinedChlorine: weekly && rng.chance(0.3) ? fixed(rng.uniform(0, 0.5), 1) : null,
      ph: fixed(round(this.ph + rng.normal(0, 0.04), 0.1), 1),
      totalAlkalinity: weekly ? round(this.alkalinity + rng.normal(0, 4), 10) : null,
      calciumHardness: weekly ? round(this.hardness + rng.normal(0, 8), 10) : null,
      cyanuricAcid: weekly ? round(this.cyanuric + rng.normal(0, 3), 5) : null,
      salt: weekly && this.salt > 0 ? round(this.salt + rng.normal(0, 50), 50) : null,
      tds: weekly && rng.chance(0.12) ? round(this.balance().tds + rng.normal(0, 80), 10) : null,
      temperatureC: fixed(round(this.temperature, 0.5), 1),
      copper: copper?.value ?? null,
      copperBelowDetection: copper?.below ?? false,
      iron: iron?.value ?? null,
      ironBelowDetection: iron?.below ?? false,
      manganese: manganese?.value ?? null,
      manganeseBelowDetection: manganese?.below ?? false,
      hardnessEndpoint: weekly ? (blurred ? "blurred" : "clean") : null,
      stain: this.stain ? (this.stain.fresh && weekly ? "new" : "existing") : "none",
      stainColour: this.stain ? STAIN_COLOUR[this.stain.metal] : null,
      padTint: this.pad ? (this.pad.loaded > 0.05 ? "tinted" : "none") : testsMetals ? "not_fitted" : null,
      note,
      importBatchId: imported ? this.book.importBatch.id : null,
    };
    this.tests.push(row);
    return row;
  }

  private readMetal(metal: Metal): { value: number; below: boolean } {
    const rng = this.rng;
    const truth = this.metals[metal];
    const measured = Math.max(0, truth * (1 + rng.normal(0, 0.08)) + rng.normal(0, 0.012));
    if (measured < DETECTION_LIMIT[metal]) return { value: DETECTION_LIMIT[metal], below: true };
    // Most readings come from a colour kit (two decimals), some from a photometer.
    const decimals = rng.chance(0.8) ? 2 : 3;
    return { value: fixed(measured, decimals), below: false };
  }

  // --- what the technician does ------------------------------------------------

  private act(day: number, test: WaterTestRow, sampledAt: Date, weekly: boolean) {
    if (!weekly) return;
    const dose = new Dosing(this, test, sampledAt);

    const elevated = METALS.filter((metal) => {
      const value = test[metal];
      return value !== null && value !== undefined && value >= ELEVATED[metal];
    });
    // Set-in stains get treated less often once it is clear product is not helping.
    const gap = this.stain?.setIn && day - this.stain.sinceDay > 60 ? 28 : 10;
    const due = this.lastMetalTreatmentDay === null || day - this.lastMetalTreatmentDay >= gap;
    if (elevated.length > 0 && due) this.treatMetals(day, elevated, dose);
    else if (this.ph > 7.8 || (this.ph > 7.6 && this.rng.chance(0.3))) this.lowerPh(dose);

    if (this.freeChlorine < 1) {
      const gallons = clamp((this.pool.volumeGallons / 10_000) * ((5 - this.freeChlorine) / 10), 0.5, 12);
      dose.apply("liquidChlorine", round(gallons, 0.5));
      this.freeChlorine = 5;
    }
    this.routineAlgaecide(day, dose);

    if (this.pad) {
      const age = day - this.pad.fittedDay;
      const clearNow = elevated.length === 0;
      if (age >= 28 || (clearNow && age >= 14)) this.pad = null;
    }
  }

  private treatMetals(day: number, elevated: Metal[], dose: Dosing) {
    const rng = this.rng;
    const previousFailed = this.lastMetalTreatmentDay !== null && day - this.lastMetalTreatmentDay <= 45;
    const strategy: MetalStrategy = previousFailed && rng.chance(0.6) ? "heavyWithPad" : rng.weighted(STRATEGIES);

    // Sequestrants hold best around pH 7.2 to 7.6, so acid usually goes in first.
    if (this.ph > 7.6 && rng.chance(0.85)) this.lowerPh(dose);

    const sequestrant: ProductKey | null =
      strategy === "heavyWithPad" || strategy === "heavyOnly"
        ? "sequestrantHeavy"
        : strategy === "maintenanceWithPad" || strategy === "maintenanceOnly"
          ? "sequestrantMaintenance"
          : null;
    if (sequestrant) {
      const effect = SEQUESTRANT_EFFECT[sequestrant]!;
      const amount = round(this.labelAmount(sequestrant) * rng.uniform(1.5, 2), 1);
      dose.apply(sequestrant, amount);
      this.sequestrant = {
        level: Math.min(1.3, (this.sequestrant?.level ?? 0) + 1),
        removalPerDay: effect.removalPerDay,
        decayPerDay: 0.5 ** (1 / effect.halfLifeDays),
        phFactor: this.ph > 7.6 ? 0.5 : 1,
      };
    }
    if (strategy !== "heavyOnly" && strategy !== "maintenanceOnly") {
      dose.apply("collectorPad", this.pool.volumeGallons > 30_000 ? 2 : 1);
      this.pad = { fittedDay: day, loaded: 0 };
    }

    if (elevated.includes("copper") && this.usesCopperAlgaecide && rng.chance(0.5)) {
      this.usesCopperAlgaecide = false;
      this.pendingNotes.push("Switched to a non-copper algaecide");
    }
    if (elevated.includes("copper") && this.pool.hasIoniser && this.ioniserOutput > 0.5) {
      this.ioniserOutput *= 0.7;
      this.pendingNotes.push("Ioniser output turned down");
    }
    this.lastMetalTreatmentDay = day;
    this.retestDay = day + rng.int(3, 6);
  }

  private lowerPh(dose: Dosing) {
    const pounds = clamp(this.labelAmount("phDecreaser") * ((this.ph - 7.4) / 0.2), 0.5, 20);
    dose.apply("phDecreaser", round(pounds, 0.5));
    this.ph = this.rng.normal(7.4, 0.06);
  }

  private routineAlgaecide(day: number, dose: Dosing) {
    const month = monthOf(day);
    if (month < 5 || month > 9) return;
    if (this.usesCopperAlgaecide) {
      if (day < this.nextAlgaecideDay) return;
      dose.apply("copperAlgaecide", round(this.labelAmount("copperAlgaecide"), 1));
      this.metals.copper += COPPER_PER_ALGAECIDE_DOSE * this.rng.uniform(0.8, 1.2);
      this.nextAlgaecideDay = day + this.rng.int(14, 28);
    } else if (this.pool.sanitiser === "chlorine" && this.rng.chance(0.04)) {
      dose.apply("polyquatAlgaecide", round(this.labelAmount("polyquatAlgaecide"), 1));
    }
  }

  private labelAmount(product: ProductKey): number {
    const spec = PRODUCTS.find((p) => p.key === product)!;
    return (spec.labelDose * this.pool.volumeGallons) / 10_000;
  }

  recordTreatment(product: ProductKey, amount: number, test: WaterTestRow, appliedAt: Date) {
    const spec = PRODUCTS.find((p) => p.key === product)!;
    this.applied.push({
      id: this.ids.treatment++,
      companyId: this.book.company.id,
      poolId: this.pool.id,
      productId: this.book.productIds[product],
      appliedAt,
      amount,
      unit: spec.doseUnit,
      appliedBy: this.pool.technicianId,
      cost: fixed(amount * spec.unitCost, 2),
      waterTestId: test.id,
      importBatchId: test.importBatchId ?? null,
    });
  }
}

/** Treatments of one visit, a few minutes apart after the sample. */
class Dosing {
  private count = 0;

  constructor(
    private readonly simulation: PoolSimulation,
    private readonly test: WaterTestRow,
    private readonly sampledAt: Date,
  ) {}

  apply(product: ProductKey, amount: number) {
    this.count++;
    const appliedAt = new Date(this.sampledAt.getTime() + (5 + 4 * this.count) * 60_000);
    this.simulation.recordTreatment(product, amount, this.test, appliedAt);
  }
}
