import { randomUUID } from "node:crypto";
import { setTimeout as sleep } from "node:timers/promises";
import { describe, expect, it } from "vitest";
import { signInOverHttp } from "../fixtures/http";
import { DEMO_EMAIL_DOMAIN, type DemoUserKey } from "../../drizzle/seed/names";
import { clusterScript, connect, currentWriter, HTTP_URL, NODES, nodeUrl, recordedPid } from "./cluster";

// The schedule of faults, in seconds from the start of the workload.
const IMPORT_AT = 4;
const KILL_WRITER_AT = 12;
const KILL_APP_AT = 14;
const RESTART_NODE_AT = 18;
const RESTART_APP_AT = 22;
const WORKLOAD_SECONDS = 60;
const IMPORT_ROWS = 20_000;
// HAProxy marks a dead app down after two failed checks a second apart; requests
// started before that may meet the dead instance.
const APP_FAILOVER_GRACE_MS = 4_000;

type Sample = { at: number; ms: number; status: number; instance: string | null; what: string };
type Visit = { key: string; poolId: number; answered: boolean };

const samples: Sample[] = [];
let t0 = 0;
const now = () => Date.now() - t0;

type Answer = { status: number; headers: Headers; body: string };

/** One request through HAProxy, its body read; null when no answer came (connection reset, timeout). */
async function request(what: string, path: string, cookie: string, init: RequestInit = {}): Promise<Answer | null> {
  const at = now();
  try {
    const response = await fetch(`${HTTP_URL}${path}`, {
      ...init,
      headers: { Cookie: cookie, Origin: HTTP_URL, ...(init.headers as Record<string, string> | undefined) },
      redirect: "manual",
      signal: AbortSignal.timeout(90_000),
    });
    const body = await response.text();
    samples.push({ at, ms: now() - at, status: response.status, instance: response.headers.get("x-patina-instance"), what });
    return { status: response.status, headers: response.headers, body };
  } catch {
    samples.push({ at, ms: now() - at, status: 0, instance: null, what });
    return null;
  }
}

function processAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
}

async function saveVisit(cookie: string, visit: Visit): Promise<boolean> {
  const body = new URLSearchParams({ submissionKey: visit.key, ph: "7.4", freeChlorine: "2.5", note: "cluster workload" });
  const response = await request("visit", `/visit/${visit.poolId}`, cookie, {
    method: "POST",
    body,
    headers: { "Content-Type": "application/x-www-form-urlencoded" },
  });
  // A saved visit answers with a redirect to its pool page.
  const saved = response?.status === 302 && (response.headers.get("location") ?? "").includes("saved=");
  if (response && !saved && response.status < 500) throw new Error(`a visit was refused: ${response.status}`);
  return saved;
}

async function poolsOf(technician: string): Promise<number[]> {
  const connection = await connect();
  try {
    const [rows] = (await connection.query(
      `SELECT p.id FROM pools p JOIN route_technicians rt ON rt.route_id = p.route_id JOIN user u ON u.id = rt.user_id
        WHERE u.email = ? ORDER BY p.id`,
      [`${technician}@${DEMO_EMAIL_DOMAIN}`],
    )) as unknown as [Array<{ id: number }>];
    return rows.map((r) => r.id);
  } finally {
    await connection.end();
  }
}

/** A log of daily noon readings from 2005 on, one a day for each of 40 demo pools (long before the demo history, clear of clock changes). */
async function importFile(): Promise<{ bytes: Uint8Array<ArrayBuffer>; from: Date; to: Date }> {
  const connection = await connect();
  const [pools] = (await connection.query("SELECT account_code AS code FROM pools ORDER BY id LIMIT 40")) as unknown as [Array<{ code: string }>];
  await connection.end();
  const from = Date.UTC(2005, 0, 1, 12);
  const days = Math.ceil(IMPORT_ROWS / pools.length);
  const lines = ["Account,Date,pH,Cu"];
  for (let i = 0; i < IMPORT_ROWS; i++) {
    const day = new Date(from + Math.floor(i / pools.length) * 86_400_000).toISOString().slice(0, 10);
    lines.push(`${pools[i % pools.length]!.code},${day} 12:00,7.${i % 10},0.${i % 5}`);
  }
  // A day either side: the company's time zone moves noon by some hours.
  return {
    bytes: new TextEncoder().encode(lines.join("\n")) as Uint8Array<ArrayBuffer>,
    from: new Date(from - 86_400_000),
    to: new Date(from + (days + 1) * 86_400_000),
  };
}

const COMMIT_FORM = { intent: "commit", "column-0": "accountCode", "column-1": "sampledAt", "column-2": "ph", "column-3": "copper", "unit-3": "mgL" };

async function uploadFile(cookie: string, bytes: Uint8Array<ArrayBuffer>): Promise<string> {
  for (let attempt = 0; attempt < 60; attempt++) {
    const form = new FormData();
    form.append("file", new File([bytes], "cluster-log.csv", { type: "text/csv" }));
    const response = await request("import upload", "/api/imports/uploads", cookie, { method: "POST", body: form, headers: { Accept: "application/json" } });
    if (response?.status === 201) return (JSON.parse(response.body) as { uploadId: string }).uploadId;
    await sleep(500);
  }
  throw new Error("the file could not be uploaded within 60 tries");
}

async function commitImport(cookie: string, uploadId: string) {
  return request("import commit", `/imports/${uploadId}`, cookie, { method: "POST", body: new URLSearchParams(COMMIT_FORM) });
}

async function importedRows(from: Date, to: Date): Promise<number> {
  const connection = await connect();
  try {
    const [[row]] = (await connection.query("SELECT COUNT(*) AS n FROM water_tests WHERE sampled_at >= ? AND sampled_at < ?", [from, to])) as unknown as [[{ n: number }]];
    return Number(row.n);
  } finally {
    await connection.end();
  }
}

async function storedCountsByKey(keys: string[]): Promise<Map<string, number>> {
  const connection = await connect();
  try {
    const counts = new Map(keys.map((k) => [k, 0]));
    for (let i = 0; i < keys.length; i += 500) {
      const [rows] = (await connection.query("SELECT submission_key AS k, COUNT(*) AS n FROM water_tests WHERE submission_key IN (?) GROUP BY submission_key", [
        keys.slice(i, i + 500),
      ])) as unknown as [Array<{ k: string; n: number }>];
      for (const row of rows) counts.set(row.k, Number(row.n));
    }
    return counts;
  } finally {
    await connection.end();
  }
}

/** CHECKSUM TABLE of every table, read on one node after it has applied everything (wsrep_sync_wait). */
async function checksumsOn(node: number): Promise<Record<string, string>> {
  const connection = await connect(nodeUrl(node));
  try {
    await connection.query("SET SESSION wsrep_sync_wait = 15");
    const [tables] = (await connection.query("SELECT table_name AS name FROM information_schema.tables WHERE table_schema = DATABASE() ORDER BY table_name")) as unknown as [
      Array<{ name: string }>,
    ];
    await connection.query(`SELECT COUNT(*) FROM \`${tables[0]!.name}\``);
    const [sums] = (await connection.query(`CHECKSUM TABLE ${tables.map((t) => `\`${t.name}\``).join(", ")}`)) as unknown as [Array<{ Table: string; Checksum: number }>];
    return Object.fromEntries(sums.map((s) => [s.Table.split(".")[1]!, String(s.Checksum)]));
  } finally {
    await connection.end();
  }
}

async function nodeStatus(node: number) {
  const connection = await connect(nodeUrl(node));
  try {
    const [rows] = (await connection.query("SHOW GLOBAL STATUS WHERE Variable_name IN ('wsrep_cluster_size', 'wsrep_ready', 'wsrep_local_state_comment')")) as unknown as [
      Array<{ Variable_name: string; Value: string }>,
    ];
    return Object.fromEntries(rows.map((r) => [r.Variable_name, r.Value]));
  } finally {
    await connection.end();
  }
}

describe("the cluster under a mixed workload, losing its database writer and an app instance", () => {
  it("keeps every acknowledged visit exactly once, the import whole or absent, and the nodes identical", async () => {
    const sessions: Record<string, string> = {};
    for (const key of ["tech1", "tech2", "owner", "analyst"] as DemoUserKey[]) sessions[key] = await signInOverHttp(HTTP_URL, key);
    // Three technicians: the first technician's two routes are worked from two devices.
    const technicians = [
      { cookie: sessions.tech1!, pools: await poolsOf("tech") },
      { cookie: await signInOverHttp(HTTP_URL, "tech1"), pools: await poolsOf("tech") },
      { cookie: sessions.tech2!, pools: await poolsOf("tech2") },
    ];
    for (const t of technicians) expect(t.pools.length).toBeGreaterThan(0);
    const file = await importFile();
    expect(await importedRows(file.from, file.to)).toBe(0);

    const visits: Visit[] = [];
    const savedAt: number[] = [];
    let stop = false;
    t0 = Date.now();

    const technicianLoop = async (t: (typeof technicians)[number], n: number) => {
      for (let i = 0; !stop; i++) {
        const visit: Visit = { key: randomUUID(), poolId: t.pools[(i * 7 + n) % t.pools.length]!, answered: false };
        visits.push(visit);
        visit.answered = await saveVisit(t.cookie, visit);
        if (visit.answered) savedAt.push(now());
        else await sleep(300);
        await sleep(120);
      }
    };
    const ownerLoop = async () => {
      const paths = ["/overview", "/api/analytics/summary", "/risk", "/api/summary", "/api/analytics/trend", "/pools"];
      for (let i = 0; !stop; i++) {
        await request("read", paths[i % paths.length]!, sessions.owner!);
        await sleep(150);
      }
    };
    let uploadId = "";
    let importAnswer: number | null = null;
    const importLoop = async () => {
      await sleep(IMPORT_AT * 1000);
      uploadId = await uploadFile(sessions.analyst!, file.bytes);
      importAnswer = (await commitImport(sessions.analyst!, uploadId))?.status ?? 0;
    };

    const faults: Record<string, number> = {};
    let killedNode = 0;
    const faultLoop = async () => {
      await sleep(KILL_WRITER_AT * 1000);
      killedNode = await currentWriter();
      process.kill(await recordedPid("node", killedNode), "SIGKILL");
      faults.writerKilled = now();
      await sleep((KILL_APP_AT - KILL_WRITER_AT) * 1000);
      process.kill(await recordedPid("app", 1), "SIGKILL");
      faults.appKilled = now();
      // The node's rejoin (recovery, then IST) takes longest, so it starts first and the app restarts meanwhile.
      await sleep(Math.max(0, RESTART_NODE_AT * 1000 - now()));
      const rejoin = clusterScript("start-node", String(killedNode)).then(() => (faults.nodeRejoined = now()));
      await sleep(Math.max(0, RESTART_APP_AT * 1000 - now()));
      await clusterScript("start-app", "1");
      faults.appRestarted = now();
      await rejoin;
    };

    const app2Pid = await recordedPid("app", 2);
    const faultsDone = faultLoop();
    const workload = [...technicians.map((t, n) => technicianLoop(t, n)), ownerLoop(), importLoop()];
    await faultsDone;
    await sleep(Math.max(0, WORKLOAD_SECONDS * 1000 - now()));
    stop = true;
    await Promise.all(workload);

    // Failover is complete once a write succeeded on the new writer and the dead app instance is out of rotation.
    const firstWriteAfterKill = savedAt.find((at) => at > faults.writerKilled!) ?? Infinity;
    const failoverDone = Math.max(firstWriteAfterKill, faults.appKilled! + APP_FAILOVER_GRACE_MS);
    const lateFailures = samples.filter((s) => s.at > failoverDone && (s.status >= 500 || s.status === 0));

    // Visits: acknowledged ones stored exactly once; unanswered ones at most once, and once after a resubmission.
    const counts = await storedCountsByKey(visits.map((v) => v.key));
    const acknowledged = visits.filter((v) => v.answered);
    const unanswered = visits.filter((v) => !v.answered);
    const lost = acknowledged.filter((v) => counts.get(v.key) === 0).length;
    const duplicated = visits.filter((v) => (counts.get(v.key) ?? 0) > 1).length;
    const unansweredButStored = unanswered.filter((v) => counts.get(v.key) === 1).length;
    const cookieFor = (visit: Visit) => technicians.find((t) => t.pools.includes(visit.poolId))!.cookie;
    for (const visit of unanswered) expect(await saveVisit(cookieFor(visit), visit)).toBe(true);
    const afterResubmission = await storedCountsByKey(unanswered.map((v) => v.key));

    // The import: whole or absent, and it can be committed afterwards.
    const importedDuringRun = await importedRows(file.from, file.to);
    if (importedDuringRun === 0) {
      const again = await commitImport(sessions.analyst!, uploadId);
      expect(again?.status).toBe(302);
    }
    const importedAfter = await importedRows(file.from, file.to);

    let longestGap = 0;
    for (let i = 1; i < savedAt.length; i++) longestGap = Math.max(longestGap, savedAt[i]! - savedAt[i - 1]!);
    const byInstance: Record<string, number> = {};
    for (const s of samples) if (s.instance) byInstance[s.instance] = (byInstance[s.instance] ?? 0) + 1;
    const statusCounts: Record<string, number> = {};
    for (const s of samples) statusCounts[s.status] = (statusCounts[s.status] ?? 0) + 1;

    // The instance that was not killed rode out the failover without exiting.
    const app2Survived = (await recordedPid("app", 2)) === app2Pid && processAlive(app2Pid);

    // The nodes: all three back in the cluster, Synced, and holding identical tables (app instances stopped first, so nothing writes).
    await clusterScript("stop-app", "1");
    await clusterScript("stop-app", "2");
    const statuses = await Promise.all(NODES.map(nodeStatus));
    const checksums = await Promise.all(NODES.map(checksumsOn));

    console.log(
      [
        "[cluster test] figures",
        `  faults (s): writer node${killedNode} killed ${(faults.writerKilled! / 1000).toFixed(1)}, app1 killed ${(faults.appKilled! / 1000).toFixed(1)}, app1 back ${(faults.appRestarted! / 1000).toFixed(1)}, node${killedNode} rejoined ${(faults.nodeRejoined! / 1000).toFixed(1)}`,
        `  visit saves: ${visits.length} sent, ${acknowledged.length} acknowledged, ${unanswered.length} unanswered (${unansweredButStored} of them stored anyway, once), lost ${lost}, duplicated ${duplicated}`,
        `  longest time without a successful write: ${(longestGap / 1000).toFixed(1)} s; first write after the writer was killed: ${((firstWriteAfterKill - faults.writerKilled!) / 1000).toFixed(1)} s later`,
        `  import of ${IMPORT_ROWS.toLocaleString("en-US")} rows: answered ${importAnswer}, ${importedDuringRun.toLocaleString("en-US")} rows stored by the run, ${importedAfter.toLocaleString("en-US")} after`,
        `  requests: ${samples.length} (${Object.entries(statusCounts).map(([s, n]) => `${s === "0" ? "no answer" : s} ${n}`).join(", ")}); served by ${Object.entries(byInstance).sort().map(([i, n]) => `${i} ${n}`).join(", ")}`,
        `  5xx or no answer after failover completed (${(failoverDone / 1000).toFixed(1)} s): ${lateFailures.length}`,
        ...lateFailures.map((f) => `    ${f.what} at ${(f.at / 1000).toFixed(1)} s: ${f.status || "no answer"} after ${f.ms} ms (${f.instance ?? "no instance"})`),
        `  app2 (never killed) still running: ${app2Survived ? "yes" : "no"}`,
        `  nodes: ${statuses.map((s, i) => `node${i + 1} ${s.wsrep_local_state_comment} size ${s.wsrep_cluster_size}`).join(", ")}`,
      ].join("\n"),
    );

    expect(app2Survived).toBe(true);
    expect(acknowledged.length).toBeGreaterThan(50);
    expect(lost).toBe(0);
    expect(duplicated).toBe(0);
    expect([...afterResubmission.values()].every((n) => n === 1)).toBe(true);
    expect([0, IMPORT_ROWS]).toContain(importedDuringRun);
    expect(importedAfter).toBe(IMPORT_ROWS);
    expect(lateFailures).toEqual([]);
    expect(Object.keys(byInstance).sort()).toEqual(["app1", "app2"]);
    for (const status of statuses) expect(status).toEqual({ wsrep_cluster_size: "3", wsrep_ready: "ON", wsrep_local_state_comment: "Synced" });
    expect(checksums[1]).toEqual(checksums[0]);
    expect(checksums[2]).toEqual(checksums[0]);
  });

  it("keeps its schema Galera-ready: every table InnoDB with a primary key", async () => {
    const connection = await connect();
    try {
      const [tables] = (await connection.query(
        `SELECT t.table_name AS name, t.engine,
                EXISTS (SELECT 1 FROM information_schema.table_constraints c
                         WHERE c.table_schema = t.table_schema AND c.table_name = t.table_name AND c.constraint_type = 'PRIMARY KEY') AS hasPrimaryKey
           FROM information_schema.tables t WHERE t.table_schema = DATABASE() AND t.table_type = 'BASE TABLE'`,
      )) as unknown as [Array<{ name: string; engine: string; hasPrimaryKey: number }>];
      expect(tables.length).toBeGreaterThan(20);
      expect(tables.filter((t) => t.engine !== "InnoDB" || !Number(t.hasPrimaryKey)).map((t) => t.name)).toEqual([]);
    } finally {
      await connection.end();
    }
  });
});
