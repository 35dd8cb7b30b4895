// Seeds the demo company:
//   npx tsx drizzle/seed/run.ts [--if-empty] [--pools N] [--years N] [--seed N] [--end YYYY-MM-DD] [--causes]
// DATABASE_URL picks the database (default: the local development database).
// --causes also prints where the metal causes were planted, to check analytics against.
import { parseArgs } from "node:util";
import { keepCompanyCurrent } from "../../app/.server/analytics/kept/versions";
import { analyzeTables, closeDatabase, createDatabase, createPool } from "../../app/.server/db/client";
import { localDatabaseUrl } from "../../app/.server/db/local-url";
import { seedDemo, type SeedSummary } from "./insert";
import { buildRouteBook } from "./routebook";
import { DEFAULT_OPTIONS, plantedCauses } from "./scenario";
import { DEMO_EMAIL_DOMAIN, DEMO_USERS } from "./names";

const DEFAULT_URL = localDatabaseUrl("patina");

const { values } = parseArgs({
  options: {
    "if-empty": { type: "boolean", default: false },
    pools: { type: "string" },
    years: { type: "string" },
    seed: { type: "string" },
    end: { type: "string" },
    causes: { type: "boolean", default: false },
  },
});

const wholeNumber = (text: string | undefined, name: string, fallback: number) => {
  if (text === undefined) return fallback;
  const value = Number(text);
  if (!Number.isInteger(value)) throw new Error(`--${name} must be a whole number, got "${text}"`);
  return value;
};

function printSignIns(users: readonly { email: string; password: string; role: string }[]) {
  console.log("[seed] demo sign-ins:");
  for (const u of users) console.log(`  ${u.role.padEnd(10)} ${u.email.padEnd(28)} ${u.password}`);
}

function printCounts(summary: SeedSummary) {
  const counts = Object.entries(summary.counts).map(([table, n]) => `${table} ${n.toLocaleString("en-US")}`);
  console.log(`[seed] ${summary.companyName}, ${summary.town} (company ${summary.companyId}): ${counts.join(", ")}`);
}

const url = process.env.DATABASE_URL ?? DEFAULT_URL;
// The kept analytics are built through the server's own database access, which reads DATABASE_URL.
process.env.DATABASE_URL = url;
const pool = createPool(url);
try {
  const db = createDatabase(pool);
  const [rows] = (await pool.query("SELECT COUNT(*) AS n FROM companies")) as unknown as [{ n: number }[]];
  if (values["if-empty"] && Number(rows[0]?.n ?? 0) > 0) {
    console.log("[seed] demo data already present");
    printSignIns(DEMO_USERS.map((u) => ({ email: `${u.email}@${DEMO_EMAIL_DOMAIN}`, password: u.password, role: u.role })));
  } else {
    const options = {
      seed: wholeNumber(values.seed, "seed", DEFAULT_OPTIONS.seed),
      pools: wholeNumber(values.pools, "pools", DEFAULT_OPTIONS.pools),
      years: wholeNumber(values.years, "years", DEFAULT_OPTIONS.years),
      endDate: values.end ?? DEFAULT_OPTIONS.endDate,
    };
    const started = Date.now();
    let lastReport = started;
    const summary = await seedDemo(db, {
      ...options,
      onProgress: (done, total) => {
        if (Date.now() - lastReport < 5000) return;
        lastReport = Date.now();
        console.log(`[seed] ${done} of ${total} pools written`);
      },
    });
    // Fresh statistics, so the first analytics queries get the right join order.
    await analyzeTables(pool);
    // The kept analytics, so the first pages answer from them.
    const keptStarted = Date.now();
    await keepCompanyCurrent(summary.companyId);
    console.log(`[seed] kept analytics built in ${((Date.now() - keptStarted) / 1000).toFixed(1)} s`);
    const seconds = ((Date.now() - started) / 1000).toFixed(1);
    console.log(`[seed] seeded ${options.pools} pools over ${options.years} years (seed ${options.seed}) in ${seconds} s`);
    printCounts(summary);
    if (values.causes) console.log(JSON.stringify(plantedCauses(buildRouteBook(options)), null, 2));
    printSignIns(summary.users);
  }
} catch (error) {
  // Driver errors carry the whole multi-row statement; the cause is what helps.
  const cause = error instanceof Error && error.cause instanceof Error ? error.cause : error;
  console.error(`[seed] failed: ${cause instanceof Error ? cause.message : String(cause)}`);
  process.exitCode = 1;
} finally {
  await pool.end();
  await closeDatabase();
}
