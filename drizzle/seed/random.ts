// A small seeded random source (mulberry32) so the demo scenario is the same on
// every run. Math.random is never used by the seed.

/** 32-bit FNV-1a hash of a string, used to derive independent sub-streams. */
export function hashString(text: string): number {
  let hash = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    hash ^= text.charCodeAt(i);
    hash = Math.imul(hash, 0x01000193);
  }
  return hash >>> 0;
}

export class Random {
  private state: number;

  constructor(seed: number) {
    this.state = seed >>> 0;
  }

  /**
   * An independent stream for one part of the scenario (one pool, one source),
   * so generating pool 40 never depends on how many numbers pool 39 drew.
   */
  fork(label: string | number): Random {
    return new Random(hashString(`${this.state}:${label}`));
  }

  /** Uniform in [0, 1). */
  next(): number {
    this.state = (this.state + 0x6d2b79f5) >>> 0;
    let t = this.state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  }

  uniform(low: number, high: number): number {
    return low + (high - low) * this.next();
  }

  /** Integer in [low, high], both ends included. */
  int(low: number, high: number): number {
    return low + Math.floor(this.next() * (high - low + 1));
  }

  /** Normal deviate by Box-Muller (one of the pair is discarded for simplicity). */
  normal(mean = 0, sd = 1): number {
    const u = 1 - this.next();
    const v = this.next();
    return mean + sd * Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
  }

  chance(probability: number): boolean {
    return this.next() < probability;
  }

  pick<T>(items: readonly T[]): T {
    if (items.length === 0) throw new Error("pick from an empty list");
    return items[Math.floor(this.next() * items.length)] as T;
  }

  /** Pick by weight: entries are [item, weight]. */
  weighted<T>(entries: readonly (readonly [T, number])[]): T {
    const total = entries.reduce((sum, [, weight]) => sum + weight, 0);
    let target = this.next() * total;
    for (const [item, weight] of entries) {
      target -= weight;
      if (target < 0) return item;
    }
    const last = entries[entries.length - 1];
    if (!last) throw new Error("weighted pick from an empty list");
    return last[0];
  }

  shuffle<T>(items: readonly T[]): T[] {
    const copy = [...items];
    for (let i = copy.length - 1; i > 0; i--) {
      const j = Math.floor(this.next() * (i + 1));
      [copy[i], copy[j]] = [copy[j] as T, copy[i] as T];
    }
    return copy;
  }
}

/** A deterministic lowercase hex string, e.g. for ids that must look random but repeat per seed. */
export function hexFromLabel(label: string, length: number): string {
  const rng = new Random(hashString(label));
  let hex = "";
  while (hex.length < length) hex += Math.floor(rng.next() * 4294967296).toString(16).padStart(8, "0");
  return hex.slice(0, length);
}
