// Queues and sends this week's digests now: npx tsx .dev/digest-cli.ts [--now 2026-06-22T07:00:00Z] [--only-due]
import { parseArgs } from "node:util";
import { closeDatabase } from "../app/.server/db/client";
import { sendWeeklyDigests } from "../app/.server/mail/digest";
import { deliverDueMail } from "../app/.server/mail/outbox";

const { values } = parseArgs({ options: { now: { type: "string" }, "only-due": { type: "boolean", default: false } } });
const now = values.now ? new Date(values.now) : new Date();
if (Number.isNaN(now.getTime())) {
  console.error(`--now: "${values.now}" is not a date and time (use e.g. 2026-06-22T07:00:00Z)`);
  process.exit(2);
}
try {
  const run = await sendWeeklyDigests(now, { onlyDue: values["only-due"] });
  const delivery = await deliverDueMail();
  console.log(`[patina] digests queued: ${run.queued} for ${run.companies} companies; sent now: ${delivery.sent}, to retry: ${delivery.failed}`);
} finally {
  await closeDatabase();
}
