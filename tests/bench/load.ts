/**
 * Load on the built server: owners asking for the route-book summary (the
 * heaviest analytics answer) at concurrency 10 and 50, printing requests per
 * second, p50 and p99 latency, errors (connection errors, timeouts and non-2xx
 * answers) and the server's peak resident memory (VmHWM).
 *
 *   npx tsx tests/bench/load.ts <label>=<database url> [<label>=<database url> …]
 *
 * Each database must hold a seeded demo company (drizzle/seed/run.ts). Run
 * `npx react-router build` first. Limits come from the environment as in production.
 */
import { readFileSync } from "node:fs";
import autocannon from "autocannon";
import { signInOverHttp } from "../fixtures/http";
import { startBuiltServer, stopBuiltServer } from "../fixtures/server";

const port = Number(process.env.PATINA_LOAD_PORT ?? Number(process.env.PATINA_BROWSER_TEST_PORT ?? 3100) + 60);
const baseUrl = `http://localhost:${port}`;
const seconds = Number(process.env.PATINA_LOAD_SECONDS ?? 60);
const paths = (process.env.PATINA_LOAD_PATHS ?? "/api/analytics/summary").split(",");

/** The process's peak resident set so far, in MB (Linux). */
function peakRssMb(pid: number): number {
  const line = readFileSync(`/proc/${pid}/status`, "utf8").split("\n").find((l) => l.startsWith("VmHWM:"));
  return Math.round(Number(line?.match(/(\d+)/)?.[1] ?? 0) / 1024);
}

for (const target of process.argv.slice(2)) {
  const [label, url] = target.split(/=(.*)/s) as [string, string];
  for (const connections of [10, 50]) {
    // A fresh server per case, so its peak memory belongs to this case alone.
    const server = await startBuiltServer(url, { port, env: { NODE_ENV: "production" } });
    try {
      const cookie = await signInOverHttp(baseUrl, "owner");
      const result = await autocannon({
        url: baseUrl,
        connections,
        duration: seconds,
        timeout: 60,
        headers: { cookie },
        requests: paths.map((path) => ({ method: "GET" as const, path })),
      });
      const failures = result.errors + result.timeouts + result.non2xx;
      console.log(
        `[load] ${label.padEnd(12)} c=${String(connections).padStart(2)}  ${result.requests.average.toFixed(1).padStart(6)} req/s  ` +
          `p50 ${String(result.latency.p50).padStart(5)} ms  p99 ${String(result.latency.p99).padStart(5)} ms  ` +
          `requests ${result.requests.total}  errors ${failures} (conn ${result.errors}, timeouts ${result.timeouts}, non-2xx ${result.non2xx})  ` +
          `peak RSS ${peakRssMb(server.pid!)} MB`,
      );
    } finally {
      await stopBuiltServer(server);
    }
  }
}
