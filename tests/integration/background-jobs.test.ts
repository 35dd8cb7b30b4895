import { type ChildProcess, spawn } from "node:child_process";
import { once } from "node:events";
import { setTimeout as sleep } from "node:timers/promises";
import { and, eq, like, sql } from "drizzle-orm";
import { afterAll, afterEach, describe, expect, it } from "vitest";
import { closeDatabase, db } from "~/.server/db/client";
import { alertEvents, backgroundJobs, mailOutbox } from "~/.server/db/schema";
import { claimHolder } from "~/.server/jobs/claims";
import { runLapsedJobs } from "~/.server/jobs/sweeper";
import { ALERT_JOB, afterWaterTestsSaved, type RecordedAlert } from "~/.server/mail/alerts";
import { DIGEST_JOB, type DigestRun, digestJobKey, digestWeek, sendWeeklyDigests } from "~/.server/mail/digest";
import { addTest } from "../fixtures/company";
import { routeBookPerFile } from "../fixtures/route-book";

const book = routeBookPerFile({
  company: "Job company",
  routes: { loop: "Wednesday loop" },
  pools: {
    p1: { route: "loop", accountCode: "JB-1", street: "1 Kestrel Row" },
    p2: { route: "loop", accountCode: "JB-2", street: "2 Kestrel Row" },
  },
  members: { owner: "owner", manager1: "manager", manager2: "manager", technician: { role: "technician", routes: ["loop"] } },
});
const { owner, manager1, manager2 } = book.member;

// Monday 6 July 2026, noon UTC (the company's time zone): ISO week 2026-W28.
const MONDAY = new Date("2026-07-06T12:00:00Z");
const WEEK_MS = 7 * 86_400_000;

const children = new Set<ChildProcess>();

/** Another server instance: a process of its own running one step (tests/fixtures/job-child.ts). */
function instance(args: string[]) {
  const child = spawn(process.execPath, ["--import", "tsx", "tests/fixtures/job-child.ts", ...args], {
    env: process.env,
    stdio: ["ignore", "pipe", "pipe"],
  });
  children.add(child);
  let output = "";
  child.stdout!.on("data", (piece) => (output += piece));
  child.stderr!.on("data", (piece) => (output += piece));
  const exited = new Promise<string>((resolve, reject) => {
    child.once("exit", (code) => {
      children.delete(child);
      if (code === 0) resolve(output);
      else reject(new Error(`the instance exited with ${code}:\n${output}`));
    });
  });
  // A killed instance's exit is expected; only the tests that wait for the exit look at it.
  exited.catch(() => undefined);
  const said = (text: string) =>
    new Promise<string>((resolve, reject) => {
      const look = () => {
        const line = output.split("\n").find((l) => l.startsWith(text));
        if (line) resolve(line);
      };
      child.stdout!.on("data", look);
      child.once("exit", (code) => reject(new Error(`the instance exited (${code}) before saying "${text}":\n${output}`)));
    });
  return { child, exited, said };
}

async function killHard(child: ChildProcess) {
  if (child.exitCode !== null || child.signalCode !== null) return;
  const exited = once(child, "exit");
  child.kill("SIGKILL");
  await exited;
}

afterEach(async () => {
  for (const child of children) await killHard(child);
});
afterAll(closeDatabase);

async function digestMail(week: string) {
  return db()
    .select({ recipient: mailOutbox.recipient })
    .from(mailOutbox)
    .where(and(eq(mailOutbox.companyId, book.companyId), eq(mailOutbox.kind, "digest"), like(mailOutbox.dedupeKey, `digest:%:${week}`)));
}

async function jobRow(key: string) {
  const [row] = await db().select().from(backgroundJobs).where(eq(backgroundJobs.jobKey, key));
  return row!;
}

/** Waits until the job's lease has ended by the database's clock. */
async function untilLeaseEnds(key: string) {
  for (let attempt = 0; attempt < 100; attempt++) {
    const [row] = await db()
      .select({ ended: sql<number>`${backgroundJobs.claimExpiresAt} <= NOW(3)` })
      .from(backgroundJobs)
      .where(eq(backgroundJobs.jobKey, key));
    if (Number(row?.ended) === 1) return;
    await sleep(200);
  }
  throw new Error(`the lease of ${key} did not end`);
}

const everyDigestRecipient = () => [owner.email, manager1.email, manager2.email].sort();

describe("the weekly digest with several instances", () => {
  it("two processes and this one running the same week at once queue one message per owner and manager", async () => {
    const week = digestWeek(MONDAY, "UTC");
    expect(week).toBe("2026-W28");
    const first = instance(["digest", String(book.companyId), MONDAY.toISOString()]);
    const second = instance(["digest", String(book.companyId), MONDAY.toISOString()]);
    const [a, b, here] = await Promise.all([
      first.exited.then((out) => JSON.parse(out.trim().split("\n").at(-1)!) as DigestRun),
      second.exited.then((out) => JSON.parse(out.trim().split("\n").at(-1)!) as DigestRun),
      sendWeeklyDigests(MONDAY, { companyIds: [book.companyId] }),
    ]);
    // Owner, two managers = 3 messages, queued by whichever instance held the week's job; the technician gets none.
    expect(a.queued + b.queued + here.queued).toBe(3);
    expect(a.companies + b.companies + here.companies).toBe(1);
    expect((await digestMail(week)).map((m) => m.recipient).sort()).toEqual(everyDigestRecipient());
    const job = await jobRow(digestJobKey(book.companyId, week));
    expect(job).toMatchObject({ kind: DIGEST_JOB, status: "done", attempts: 1, claimExpiresAt: null });

    // The week is done: a later hourly run on any instance queues nothing more.
    expect(await sendWeeklyDigests(new Date(MONDAY.getTime() + 3_600_000), { companyIds: [book.companyId] })).toEqual({ companies: 0, queued: 0 });
    expect(await digestMail(week)).toHaveLength(3);
  });

  it("an instance killed while it holds the week is taken over once its lease ends, and the week is sent once", async () => {
    const monday = new Date(MONDAY.getTime() + WEEK_MS);
    const week = digestWeek(monday, "UTC");
    const key = digestJobKey(book.companyId, week);
    const holder = instance(["claim", key, DIGEST_JOB, String(book.companyId), JSON.stringify({ week, at: monday.toISOString() }), "3000"]);
    const claimedBy = (await holder.said("claimed ")).slice("claimed ".length);
    await killHard(holder.child);

    // While the dead instance's lease lasts, nobody else sends the week.
    expect(await sendWeeklyDigests(monday, { companyIds: [book.companyId] })).toEqual({ companies: 0, queued: 0 });
    await runLapsedJobs();
    expect(await digestMail(week)).toHaveLength(0);
    expect(await jobRow(key)).toMatchObject({ status: "pending", claimedBy, attempts: 1 });

    await untilLeaseEnds(key);
    expect((await runLapsedJobs()).taken).toBeGreaterThanOrEqual(1);
    expect((await digestMail(week)).map((m) => m.recipient).sort()).toEqual(everyDigestRecipient());
    const job = await jobRow(key);
    expect(job).toMatchObject({ status: "done", attempts: 2, claimedBy: claimHolder() });
    expect(job.claimedBy).not.toBe(claimedBy);

    // Taken over and done: neither the scheduler nor the sweeper sends it again.
    expect(await sendWeeklyDigests(monday, { companyIds: [book.companyId] })).toEqual({ companies: 0, queued: 0 });
    await runLapsedJobs();
    expect(await digestMail(week)).toHaveLength(3);
    expect(await jobRow(key)).toMatchObject({ status: "done", attempts: 2 });
  });
});

describe("alert checks with several instances", () => {
  async function alertRows(poolId: number) {
    return db().select().from(alertEvents).where(and(eq(alertEvents.companyId, book.companyId), eq(alertEvents.poolId, poolId)));
  }
  async function alertMail() {
    return db()
      .select({ recipient: mailOutbox.recipient, key: mailOutbox.dedupeKey })
      .from(mailOutbox)
      .where(and(eq(mailOutbox.companyId, book.companyId), eq(mailOutbox.kind, "alert")));
  }

  it("the same check run at once by another process and twice here records each alert once and mails each manager once", async () => {
    // Copper 0.45 mg/L two days before "now" is at or above the elevated level 0.30 (common practice): one episode opens.
    await addTest(book.companyId, book.pool.p1, "2026-07-04T09:00:00Z", { copper: 0.45 });
    const other = instance(["alerts", String(book.companyId), String(book.pool.p1), MONDAY.toISOString()]);
    const [there, ...here] = await Promise.all([
      other.exited.then((out) => JSON.parse(out.trim().split("\n").at(-1)!) as RecordedAlert[]),
      afterWaterTestsSaved(book.companyId, [book.pool.p1], { now: MONDAY }),
      afterWaterTestsSaved(book.companyId, [book.pool.p1], { now: MONDAY }),
    ]);
    const recorded = [there, ...here].flat();
    expect(recorded.map((r) => r.kind)).toEqual(["episode_opened"]);
    expect((await alertRows(book.pool.p1)).map((e) => [e.kind, e.metal])).toEqual([["episode_opened", "copper"]]);
    // Managers only (the company does not alert owners): two messages for one event.
    expect((await alertMail()).map((m) => m.recipient).sort()).toEqual([manager1.email, manager2.email].sort());
    const jobs = await db()
      .select({ status: backgroundJobs.status })
      .from(backgroundJobs)
      .where(and(eq(backgroundJobs.companyId, book.companyId), eq(backgroundJobs.kind, ALERT_JOB)));
    expect(jobs.map((j) => j.status)).toEqual(["done", "done", "done"]);
  });

  it("a check whose instance died before it finished is done by another once the lease ends", async () => {
    await addTest(book.companyId, book.pool.p2, "2026-07-05T09:00:00Z", { copper: 0.5 });
    const key = `${ALERT_JOB}:${book.companyId}:left-by-a-dead-instance`;
    const holder = instance(["claim", key, ALERT_JOB, String(book.companyId), JSON.stringify({ poolIds: [book.pool.p2], at: MONDAY.toISOString() }), "2000"]);
    await holder.said("claimed ");
    await killHard(holder.child);
    expect(await alertRows(book.pool.p2)).toHaveLength(0);

    await untilLeaseEnds(key);
    expect((await runLapsedJobs()).taken).toBeGreaterThanOrEqual(1);
    // Worked out as of the moment the tests were saved (MONDAY), not the sweep's: the 5 July reading is within 14 days.
    expect((await alertRows(book.pool.p2)).map((e) => [e.kind, e.metal])).toEqual([["episode_opened", "copper"]]);
    expect(await jobRow(key)).toMatchObject({ status: "done", attempts: 2 });
    expect((await alertMail()).filter((m) => m.key.includes(`episode:${book.pool.p2}:`))).toHaveLength(2);
  });
});
