import { ANALYTES, METAL_FIELDS, type MetalField } from "~/lib/imports/fields";
import type { ImportRecord } from "~/lib/imports/validate-row";

/**
 * The accepted rows of a file in typed columns, so a large file costs a few
 * dozen bytes a row instead of a tree of objects. A missing reading is NaN.
 *
 * Pools and products are numbers: a positive id is one already stored, a
 * negative one is -(n + 1) for the n-th unknown key the person chose to create.
 */
export class PlannedRows {
  length = 0;
  pool = new Int32Array(0);
  sampledAt = new Float64Array(0);
  /** ANALYTES.length readings per row, in ANALYTES order. */
  readings = new Float64Array(0);
  flags = new Uint8Array(0);
  product = new Int32Array(0);
  amount = new Float64Array(0);
  cost = new Float64Array(0);
  /** Sparse: only rows with a note or a treatment have one. */
  notes: Array<string | undefined> = [];
  units: Array<string | undefined> = [];
  readonly newPoolKeys: string[] = [];
  readonly newProductKeys: string[] = [];
  #newPools = new Map<string, number>();
  #newProducts = new Map<string, number>();

  static readonly HAS_TEST = 1;
  static readonly TEST_IS_NEW = 2;
  static readonly ADDS_TREATMENT = 4;
  static readonly BELOW_DETECTION: Record<MetalField, number> = { copper: 8, iron: 16, manganese: 32 };

  newPool(key: string): number {
    return -(this.#indexOf(this.#newPools, this.newPoolKeys, key) + 1);
  }

  newProduct(key: string): number {
    return -(this.#indexOf(this.#newProducts, this.newProductKeys, key) + 1);
  }

  #indexOf(index: Map<string, number>, keys: string[], key: string): number {
    let at = index.get(key);
    if (at === undefined) {
      at = keys.push(key) - 1;
      index.set(key, at);
    }
    return at;
  }

  /** Keeps one accepted row; `product` is 0 when the row adds no treatment. */
  add(record: ImportRecord, pool: number, product: number) {
    const i = this.length;
    if (i === this.pool.length) this.#grow(Math.max(1024, i * 2));
    this.length++;
    this.pool[i] = pool;
    this.sampledAt[i] = record.sampledAt.getTime();
    let flags = 0;
    const base = i * ANALYTES.length;
    const test = record.test;
    for (let f = 0; f < ANALYTES.length; f++) this.readings[base + f] = test?.[ANALYTES[f]!] ?? NaN;
    if (test) {
      flags |= PlannedRows.HAS_TEST;
      for (const metal of METAL_FIELDS) if (test[`${metal}BelowDetection`]) flags |= PlannedRows.BELOW_DETECTION[metal];
      if (test.note !== undefined) this.notes[i] = test.note;
    }
    this.flags[i] = flags;
    const treatment = record.treatment;
    this.product[i] = treatment ? product : 0;
    this.amount[i] = treatment?.amount ?? NaN;
    this.cost[i] = treatment?.cost ?? NaN;
    if (treatment && product !== 0) this.units[i] = treatment.unit;
  }

  has(i: number, flag: number): boolean {
    return (this.flags[i]! & flag) !== 0;
  }

  mark(i: number, flag: number, on: boolean) {
    this.flags[i] = on ? this.flags[i]! | flag : this.flags[i]! & ~flag;
  }

  /** Readings of one row in ANALYTES order, null where not measured. */
  readingsOf(i: number): Array<number | null> {
    const out = new Array<number | null>(ANALYTES.length);
    const base = i * ANALYTES.length;
    for (let f = 0; f < ANALYTES.length; f++) {
      const value = this.readings[base + f]!;
      out[f] = Number.isNaN(value) ? null : value;
    }
    return out;
  }

  #grow(capacity: number) {
    const grow = <T extends Int32Array | Float64Array | Uint8Array>(old: T, make: (n: number) => T, width = 1): T => {
      const next = make(capacity * width);
      next.set(old);
      return next;
    };
    this.pool = grow(this.pool, (n) => new Int32Array(n));
    this.sampledAt = grow(this.sampledAt, (n) => new Float64Array(n));
    this.readings = grow(this.readings, (n) => new Float64Array(n).fill(NaN), ANALYTES.length);
    this.flags = grow(this.flags, (n) => new Uint8Array(n));
    this.product = grow(this.product, (n) => new Int32Array(n));
    this.amount = grow(this.amount, (n) => new Float64Array(n));
    this.cost = grow(this.cost, (n) => new Float64Array(n));
  }
}
