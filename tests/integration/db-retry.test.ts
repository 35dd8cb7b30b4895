import type { Pool } from "mysql2/promise";
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { createPool } from "~/.server/db/client";
import { isRetryableTransactionError, retryTransaction } from "~/.server/db/retry";
import { TEST_DATABASE_URL } from "../fixtures/database";

// A table of this test's own in the test database: two counters and a keyed log.
let pool: Pool;

beforeAll(async () => {
  pool = createPool(TEST_DATABASE_URL);
  await pool.query("CREATE TABLE IF NOT EXISTS retry_probe (id INT PRIMARY KEY, n INT NOT NULL) ENGINE=InnoDB");
  await pool.query("CREATE TABLE IF NOT EXISTS retry_probe_log (id INT AUTO_INCREMENT PRIMARY KEY, unit_key VARCHAR(40) NOT NULL UNIQUE) ENGINE=InnoDB");
});

afterAll(async () => {
  await pool.query("DROP TABLE IF EXISTS retry_probe, retry_probe_log");
  await pool.end();
});

beforeEach(async () => {
  await pool.query("DELETE FROM retry_probe");
  await pool.query("INSERT INTO retry_probe (id, n) VALUES (1, 0), (2, 0)");
  await pool.query("DELETE FROM retry_probe_log");
});

/** One transaction on a connection of its own, rolled back and the connection dropped if anything fails. */
async function inTransaction<T>(work: (query: (sql: string, values?: unknown[]) => Promise<unknown>, threadId: number) => Promise<T>): Promise<T> {
  const connection = await pool.getConnection();
  let broken = false;
  try {
    await connection.beginTransaction();
    const result = await work((sql, values) => connection.query(sql, values), connection.threadId);
    await connection.commit();
    return result;
  } catch (error) {
    broken = true;
    await connection.rollback().catch(() => undefined);
    throw error;
  } finally {
    if (broken) connection.destroy();
    else connection.release();
  }
}

async function counters() {
  const [rows] = (await pool.query("SELECT id, n FROM retry_probe ORDER BY id")) as unknown as [Array<{ id: number; n: number }>];
  return rows.map((r) => r.n);
}

async function logged() {
  const [rows] = (await pool.query("SELECT unit_key AS unitKey FROM retry_probe_log ORDER BY id")) as unknown as [Array<{ unitKey: string }>];
  return rows.map((r) => r.unitKey);
}

describe("retryTransaction on MariaDB", () => {
  it("runs the deadlock victim again from the start, so both transactions land once", async () => {
    const attempts: string[] = [];
    let firstLocks = 0;
    let bothLocked!: () => void;
    const bothHoldTheirFirstRow = new Promise<void>((resolve) => (bothLocked = resolve));
    // Each transaction adds 1 to both counters, in opposite orders: a classic deadlock.
    const crossing = (first: number, second: number) =>
      retryTransaction({ unit: `crossing ${first}->${second}`, baseDelayMs: 20 }, (attempt) =>
        inTransaction(async (query) => {
          attempts.push(`${first}:${attempt}`);
          await query("UPDATE retry_probe SET n = n + 1 WHERE id = ?", [first]);
          if (attempt === 1) {
            if (++firstLocks === 2) bothLocked();
            await bothHoldTheirFirstRow;
          }
          await query("UPDATE retry_probe SET n = n + 1 WHERE id = ?", [second]);
        }),
      );
    const outcomes = await Promise.allSettled([crossing(1, 2), crossing(2, 1)]);
    expect(outcomes.map((o) => o.status)).toEqual(["fulfilled", "fulfilled"]);
    // MariaDB picked one victim; it ran a second time and nothing of its first attempt stayed.
    expect(attempts).toHaveLength(3);
    expect(attempts.filter((a) => a.endsWith(":2"))).toHaveLength(1);
    expect(await counters()).toEqual([2, 2]);
  });

  it("runs a transaction again after its connection was killed mid-way, and stores its row once", async () => {
    const other = await pool.getConnection();
    const attempts: number[] = [];
    try {
      await retryTransaction({ unit: "killed", baseDelayMs: 20 }, (attempt) =>
        inTransaction(async (query, threadId) => {
          attempts.push(attempt);
          await query("INSERT INTO retry_probe_log (unit_key) VALUES ('visit-a')");
          if (attempt === 1) await other.query(`KILL CONNECTION ${threadId}`);
          await query("UPDATE retry_probe SET n = n + 1 WHERE id = 1");
        }),
      );
    } finally {
      other.release();
    }
    expect(attempts).toEqual([1, 2]);
    expect(await logged()).toEqual(["visit-a"]);
    expect(await counters()).toEqual([1, 0]);
  });

  it("does not run again after an error of the request itself (a duplicate key)", async () => {
    await pool.query("INSERT INTO retry_probe_log (unit_key) VALUES ('visit-b')");
    const attempts: number[] = [];
    const failure = await retryTransaction({ unit: "duplicate" }, (attempt) =>
      inTransaction(async (query) => {
        attempts.push(attempt);
        await query("UPDATE retry_probe SET n = n + 1 WHERE id = 1");
        await query("INSERT INTO retry_probe_log (unit_key) VALUES ('visit-b')");
      }),
    ).catch((error: unknown) => error);
    expect(failure).toMatchObject({ code: "ER_DUP_ENTRY" });
    expect(isRetryableTransactionError(failure)).toBe(false);
    expect(attempts).toEqual([1]);
    expect(await counters()).toEqual([0, 0]);
  });

  it("gives up after the last attempt and leaves nothing behind", async () => {
    const other = await pool.getConnection();
    const attempts: number[] = [];
    try {
      const failure = await retryTransaction({ unit: "always killed", attempts: 3, baseDelayMs: 10 }, (attempt) =>
        inTransaction(async (query, threadId) => {
          attempts.push(attempt);
          await query("INSERT INTO retry_probe_log (unit_key) VALUES ('visit-c')");
          await other.query(`KILL CONNECTION ${threadId}`);
          await query("UPDATE retry_probe SET n = n + 1 WHERE id = 1");
        }),
      ).catch((error: unknown) => error);
      expect(isRetryableTransactionError(failure)).toBe(true);
    } finally {
      other.release();
    }
    expect(attempts).toEqual([1, 2, 3]);
    expect(await logged()).toEqual([]);
    expect(await counters()).toEqual([0, 0]);
  });
});
