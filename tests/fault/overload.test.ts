import type { ChildProcess } from "node:child_process";
import { setTimeout as sleep } from "node:timers/promises";
import type { Connection } from "mysql2/promise";
import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest";
import { getAnswer, signInOverHttp, type Answer } from "../fixtures/http";
import { FAULT_DATABASE_URL, FAULT_DB_NAME, FAULT_SERVER_PORT, FAULT_SERVER_URL, faultConnection } from "../fixtures/scratch-mariadb";
import { startBuiltServer, stopBuiltServer } from "../fixtures/server";

const SUMMARY = "/api/analytics/summary";

/**
 * The tables the summary cannot answer without: the tests (recomputed) and the
 * kept spans (kept results). A test connection write-locks both to keep its reads waiting.
 */
const LOCK_SUMMARY_TABLES = "LOCK TABLES water_tests WRITE, kept_pool_spans WRITE";

/** The server's statements that read those tables, as MariaDB lists them. */
async function summaryTableReads(probe: Connection) {
  const [rows] = (await probe.query(
    "SELECT id, state, info FROM information_schema.processlist WHERE db = ? AND id <> CONNECTION_ID() AND (info LIKE '%water_tests%' OR info LIKE '%kept_pool_spans%')",
    [FAULT_DB_NAME],
  )) as unknown as [Array<{ id: number; state: string; info: string }>];
  return rows;
}

/** Waits until a read of the server waits on the table lock (at most 20 s of polling). */
async function untilWaitingOnLock(probe: Connection) {
  for (let i = 0; i < 200; i++) {
    const waiting = (await summaryTableReads(probe)).filter((r) => /lock/i.test(r.state));
    if (waiting.length > 0) return waiting;
    await sleep(100);
  }
  throw new Error("no statement of the server ever waited on the lock");
}

function expectJson503(answer: Answer, code: string) {
  expect(answer.status).toBe(503);
  expect(answer.contentType).toMatch(/application\/json/);
  expect(Number(answer.retryAfter)).toBeGreaterThan(0);
  expect((JSON.parse(answer.body) as { error: { code: string } }).error.code).toBe(code);
}

/** A built server with its own limits; a test connection holds write locks (LOCK_SUMMARY_TABLES) to keep reads waiting. */
function withServer(env: Record<string, string>) {
  const state = {} as { server: ChildProcess; cookie: string; lock: Connection; probe: Connection };
  beforeAll(async () => {
    state.server = await startBuiltServer(FAULT_DATABASE_URL, { port: FAULT_SERVER_PORT, env });
    state.cookie = await signInOverHttp(FAULT_SERVER_URL, "owner");
    state.lock = await faultConnection();
    state.probe = await faultConnection();
  });
  afterEach(async () => {
    await state.lock.query("UNLOCK TABLES");
  });
  afterAll(async () => {
    await state.lock?.end();
    await state.probe?.end();
    await stopBuiltServer(state.server);
  });
  return state;
}

describe("the bound on concurrent heavy analytics (one running, no queue)", () => {
  const s = withServer({ PATINA_ANALYTICS_CONCURRENCY: "1", PATINA_ANALYTICS_QUEUE: "0", PATINA_ANALYTICS_STATEMENT_MS: "60000" });

  it("answers 503 with Retry-After beyond the queue, and lets the next one in once the slot is free", async () => {
    expect((await getAnswer(FAULT_SERVER_URL, SUMMARY, s.cookie)).status).toBe(200);
    await s.lock.query(LOCK_SUMMARY_TABLES);
    const first = getAnswer(FAULT_SERVER_URL, SUMMARY, s.cookie);
    await untilWaitingOnLock(s.probe);

    expectJson503(await getAnswer(FAULT_SERVER_URL, SUMMARY, s.cookie), "busy");
    expectJson503(await getAnswer(FAULT_SERVER_URL, "/api/analytics/trend", s.cookie), "busy");
    const page = await getAnswer(FAULT_SERVER_URL, "/overview", s.cookie);
    expect(page.status).toBe(503);
    expect(Number(page.retryAfter)).toBeGreaterThan(0);
    expect(page.body).toContain("busy with other analyses");
    // Requests that are not heavy analytics are not gated (signed in, the sign-in page sends home).
    expect((await getAnswer(FAULT_SERVER_URL, "/sign-in", s.cookie)).status).toBe(302);

    await s.lock.query("UNLOCK TABLES");
    expect((await first).status).toBe(200);
    expect((await getAnswer(FAULT_SERVER_URL, SUMMARY, s.cookie)).status).toBe(200);
  });
});

describe("the statement limit and abandoned requests (limit 1.5 s)", () => {
  const s = withServer({ PATINA_ANALYTICS_STATEMENT_MS: "1500" });

  it("stops a statement over the limit and answers 503 timeout with Retry-After", async () => {
    await s.lock.query(LOCK_SUMMARY_TABLES);
    const answer = await getAnswer(FAULT_SERVER_URL, SUMMARY, s.cookie);
    expectJson503(answer, "timeout");
    // The lock is still held, yet none of the server's reads is left waiting: they were stopped.
    expect(await summaryTableReads(s.probe)).toEqual([]);
    await s.lock.query("UNLOCK TABLES");
    expect((await getAnswer(FAULT_SERVER_URL, SUMMARY, s.cookie)).status).toBe(200);
  });

  it("kills the running statement when the client goes away", async () => {
    await s.lock.query(LOCK_SUMMARY_TABLES);
    const client = new AbortController();
    const abandoned = getAnswer(FAULT_SERVER_URL, SUMMARY, s.cookie, client.signal).catch((error: Error) => error.name);
    const waiting = await untilWaitingOnLock(s.probe);
    client.abort();
    expect(await abandoned).toBe("AbortError");
    // Well inside the 1.5 s limit, the waiting statements disappear while the lock is still held.
    let left = waiting;
    for (let i = 0; i < 50 && left.length > 0; i++) {
      await sleep(20);
      left = await summaryTableReads(s.probe);
    }
    expect(left).toEqual([]);
    await s.lock.query("UNLOCK TABLES");
    expect((await getAnswer(FAULT_SERVER_URL, SUMMARY, s.cookie)).status).toBe(200);
  });
});
