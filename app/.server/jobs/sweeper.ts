import { runAlertJob, ALERT_JOB } from "../mail/alerts";
import { DIGEST_JOB, runDigestJob } from "../mail/digest";
import { claimJobById, failJob, lapsedJobs, pruneFinishedJobs } from "./claims";

export type SweepReport = { taken: number; failed: number; pruned: number };

/**
 * Takes over the jobs whose lease has ended (their instance died, or a retry
 * after a failure is due) and runs each to the end; removes old finished ones.
 * Every instance runs this on a timer; the claim lets only one take each job.
 */
export async function runLapsedJobs(): Promise<SweepReport> {
  const report: SweepReport = { taken: 0, failed: 0, pruned: 0 };
  for (const job of await lapsedJobs()) {
    const claim = await claimJobById(job.id);
    if (!claim) continue;
    report.taken++;
    try {
      if (claim.kind === ALERT_JOB) await runAlertJob(claim);
      else if (claim.kind === DIGEST_JOB) await runDigestJob(claim);
      else await failJob(claim, new Error(`no runner for jobs of kind "${claim.kind}"`));
    } catch (error) {
      report.failed++;
      console.error(`[patina] background job ${claim.key} failed:`, error);
    }
  }
  report.pruned = await pruneFinishedJobs();
  return report;
}
