/**
 * The cluster case of `npm run bench`, on a running test cluster (.dev/cluster.sh
 * with the settings of tests/cluster/cluster.ts): requests per second through
 * HAProxy with two app instances and with one, then the failover gap of the
 * database (writes through HAProxy while the writer node is killed).
 *
 *   npx tsx tests/bench/cluster.ts
 *
 * PATINA_LOAD_SECONDS (20) per load case, PATINA_LOAD_PATHS (/api/analytics/summary,/pools).
 */
import { setTimeout as sleep } from "node:timers/promises";
import autocannon from "autocannon";
import { signInOverHttp } from "../fixtures/http";
import { clusterScript, connect, currentWriter, HTTP_URL, recordedPid } from "../cluster/cluster";

const seconds = Number(process.env.PATINA_LOAD_SECONDS ?? 20);
const paths = (process.env.PATINA_LOAD_PATHS ?? "/api/analytics/summary,/pools").split(",");

async function load(label: string, cookie: string) {
  for (const connections of [10, 50]) {
    const result = await autocannon({
      url: HTTP_URL,
      connections,
      duration: seconds,
      timeout: 60,
      headers: { cookie },
      requests: paths.map((path) => ({ method: "GET" as const, path })),
    });
    const failures = result.errors + result.timeouts + result.non2xx;
    console.log(
      `[cluster bench] ${label.padEnd(12)} c=${String(connections).padStart(2)}  ${result.requests.average.toFixed(1).padStart(6)} req/s  ` +
        `p50 ${String(result.latency.p50).padStart(5)} ms  p99 ${String(result.latency.p99).padStart(5)} ms  requests ${result.requests.total}  errors ${failures}`,
    );
  }
}

/** Writes one row every 20 ms through HAProxy while the writer is killed; the longest time between two stored rows. */
async function failoverGap(): Promise<{ gapMs: number; writes: number; killed: number }> {
  const setup = await connect();
  await setup.query("CREATE TABLE IF NOT EXISTS bench_failover (id BIGINT AUTO_INCREMENT PRIMARY KEY, at DATETIME(3) NOT NULL) ENGINE=InnoDB");
  await setup.end();
  let stop = false;
  const stored: number[] = [];
  const writer = (async () => {
    let connection: Awaited<ReturnType<typeof connect>> | null = null;
    while (!stop) {
      try {
        connection ??= await connect();
        await connection.query("INSERT INTO bench_failover (at) VALUES (NOW(3))");
        stored.push(Date.now());
      } catch {
        connection?.destroy();
        connection = null;
      }
      await sleep(20);
    }
    await connection?.end();
  })();
  await sleep(3_000);
  const killed = await currentWriter();
  process.kill(await recordedPid("node", killed), "SIGKILL");
  await sleep(12_000);
  stop = true;
  await writer;
  let gapMs = 0;
  for (let i = 1; i < stored.length; i++) gapMs = Math.max(gapMs, stored[i]! - stored[i - 1]!);
  await clusterScript("start-node", String(killed));
  return { gapMs, writes: stored.length, killed };
}

const cookie = await signInOverHttp(HTTP_URL, "owner");
await load("2 instances", cookie);
await clusterScript("stop-app", "2");
// HAProxy takes the stopped instance out of rotation after two failed checks.
await sleep(3_000);
await load("1 instance", cookie);
await clusterScript("start-app", "2");
const gap = await failoverGap();
console.log(`[cluster bench] failover: writer node${gap.killed} killed; longest time without a stored write ${(gap.gapMs / 1000).toFixed(2)} s (${gap.writes} writes in 15 s); node${gap.killed} rejoined`);
