// Writes the demo scenario into a database in one transaction, with
// multi-row inserts, pool by pool so large route books stay light on memory.
import { hashPassword } from "better-auth/crypto";
import { inArray, sql } from "drizzle-orm";
import type { MySqlTable } from "drizzle-orm/mysql-core";
import type { Database } from "../../app/.server/db/client";
import * as schema from "../../app/.server/db/schema";
import { hexFromLabel } from "./random";
import type { TreatmentRow, WaterTestRow } from "./history";
import { buildRouteBook, type IdBase } from "./routebook";
import { poolHistories, resolveOptions, type ScenarioOptions } from "./scenario";

type Transaction = Parameters<Parameters<Database["transaction"]>[0]>[0];

export type SeedOptions = Partial<ScenarioOptions> & {
  /** Called after each batch of pools is written. */
  onProgress?: (poolsDone: number, poolsTotal: number) => void;
};

export type SeedSummary = {
  companyId: number;
  companyName: string;
  town: string;
  users: { email: string; password: string; role: string; name: string }[];
  counts: Record<string, number>;
  options: ScenarioOptions;
};

const CHUNK_ROWS = 1000;

export class DemoUsersExistError extends Error {
  constructor(emails: string[]) {
    super(`demo users already exist (${emails.join(", ")}); seed an empty database`);
  }
}

export async function seedDemo(db: Database, options: SeedOptions = {}): Promise<SeedSummary> {
  const resolved = resolveOptions(options);
  const { onProgress } = options;

  return db.transaction(async (tx) => {
    const ids = await nextIds(tx);
    const book = buildRouteBook(resolved, ids);

    const existing = await tx
      .select({ email: schema.user.email })
      .from(schema.user)
      .where(inArray(schema.user.email, book.users.map((u) => u.email)));
    if (existing.length > 0) throw new DemoUsersExistError(existing.map((u) => u.email));

    const accounts = await Promise.all(
      book.users.map(async (u) => ({
        id: hexFromLabel(`account:${u.id}`, 32),
        accountId: u.id,
        providerId: "credential",
        userId: u.id,
        password: await hashPassword(u.password),
      })),
    );

    const counts: Record<string, number> = {};
    const write = async <T extends MySqlTable>(name: string, table: T, rows: T["$inferInsert"][]) => {
      for (let start = 0; start < rows.length; start += CHUNK_ROWS) {
        await tx.insert(table).values(rows.slice(start, start + CHUNK_ROWS));
      }
      counts[name] = (counts[name] ?? 0) + rows.length;
    };

    await write("companies", schema.companies, [book.company]);
    await write("users", schema.user, book.userRows);
    await write("accounts", schema.account, accounts);
    await write("memberships", schema.memberships, book.memberships);
    await write("routes", schema.routes, book.routes);
    await write("routeTechnicians", schema.routeTechnicians, book.routeTechnicians);
    await write("fillSources", schema.fillSources, book.fillSources);
    await write("sourceTests", schema.sourceTests, book.sourceTests);
    await write("products", schema.products, book.products);
    await write("importBatches", schema.importBatches, [book.importBatch]);
    await write("pools", schema.pools, book.pools);
    await write("equipment", schema.equipment, book.equipment);

    let tests: WaterTestRow[] = [];
    let treatments: TreatmentRow[] = [];
    const imported = { tests: 0, treatments: 0 };
    const flush = async () => {
      // Tests first: treatments point at the test of their visit.
      await write("waterTests", schema.waterTests, tests);
      await write("treatments", schema.treatments, treatments);
      tests = [];
      treatments = [];
    };
    let poolsDone = 0;
    for (const history of poolHistories(book)) {
      for (const row of history.waterTests) {
        tests.push(row);
        if (row.importBatchId) imported.tests++;
      }
      for (const row of history.treatments) {
        treatments.push(row);
        if (row.importBatchId) imported.treatments++;
      }
      poolsDone++;
      if (tests.length >= CHUNK_ROWS * 5) {
        await flush();
        onProgress?.(poolsDone, book.profiles.length);
      }
    }
    await flush();
    onProgress?.(poolsDone, book.profiles.length);

    await tx
      .update(schema.importBatches)
      .set({ testsAdded: imported.tests, treatmentsAdded: imported.treatments })
      .where(sql`${schema.importBatches.id} = ${book.importBatch.id}`);

    return {
      companyId: book.company.id,
      companyName: book.company.name,
      town: book.company.town ?? "",
      users: book.users.map((u) => ({ email: u.email, password: u.password, role: u.role, name: u.name })),
      counts,
      options: resolved,
    };
  });
}

/** The next free id per table, so a demo company can join a database that already has data. */
async function nextIds(tx: Transaction): Promise<IdBase> {
  const next = async (table: string) => {
    const [rows] = (await tx.execute(sql.raw(`SELECT COALESCE(MAX(id), 0) + 1 AS next FROM \`${table}\``))) as unknown as [
      { next: number | string }[],
    ];
    return Number(rows[0]?.next ?? 1);
  };
  return {
    company: await next("companies"),
    membership: await next("memberships"),
    route: await next("routes"),
    fillSource: await next("fill_sources"),
    sourceTest: await next("source_tests"),
    pool: await next("pools"),
    equipment: await next("equipment"),
    product: await next("products"),
    importBatch: await next("import_batches"),
    waterTest: await next("water_tests"),
    treatment: await next("treatments"),
  };
}
