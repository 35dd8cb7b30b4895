import { describe, expect, it } from "vitest";
import { ConcurrencyGate, GateRefused } from "./gate";
import { RequestAbandoned } from "../request-context";

const gate = (concurrency: number, queue: number, waitMs = 60_000) => new ConcurrencyGate(() => ({ concurrency, queue, waitMs }));

describe("the analytics gate", () => {
  it("lets `concurrency` in, queues `queue` more in order, and refuses the rest", async () => {
    const g = gate(2, 1);
    const a = await g.enter();
    const b = await g.enter();
    const admitted: string[] = [];
    const c = g.enter().then((release) => (admitted.push("c"), release));
    await expect(g.enter()).rejects.toEqual(new GateRefused("queue-full"));
    expect(g.stats).toEqual({ running: 2, waiting: 1 });
    a();
    const releaseC = await c;
    expect(admitted).toEqual(["c"]);
    expect(g.stats).toEqual({ running: 2, waiting: 0 });
    b();
    releaseC();
    releaseC(); // a second call gives nothing back twice
    expect(g.stats).toEqual({ running: 0, waiting: 0 });
  });

  it("refuses a waiter whose wait runs out, and drops one whose client left", async () => {
    const g = gate(1, 2, 10);
    const held = await g.enter();
    await expect(g.enter()).rejects.toEqual(new GateRefused("waited-too-long"));
    const client = new AbortController();
    const leaving = g.enter(client.signal);
    client.abort();
    await expect(leaving).rejects.toBeInstanceOf(RequestAbandoned);
    expect(g.stats).toEqual({ running: 1, waiting: 0 });
    held();
    expect(g.stats).toEqual({ running: 0, waiting: 0 });
  });
});
