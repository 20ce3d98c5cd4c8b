import { latestReassessment } from "@/lib/assessment/jobs";
import { formatCount, formatDateTime } from "@/lib/format/numbers";
import { RefreshWhileRunning } from "./refresh-while-running";

/**
 * Progress of the latest full re-assessment (after the thresholds or a substance changed). While
 * it runs the page refreshes itself, so the register fills in as locations are re-assessed.
 */
export function ReassessmentBanner() {
  const job = latestReassessment();
  if (!job) return null;
  if (job.status === "queued" || job.status === "running") {
    const total = job.total ?? 0;
    const done = Math.min(job.progress, total);
    return (
      <section aria-label="Re-assessment in progress" className="space-y-2 rounded-lg border border-accent-200 bg-accent-50 px-4 py-3 text-sm text-ink-800">
        <RefreshWhileRunning />
        <p className="font-medium text-ink-900">
          {job.status === "queued" ? "Re-assessment queued: " : "Re-assessing locations: "}
          <span className="tabular">
            {formatCount(done)} of {formatCount(total)}
          </span>
        </p>
        <div
          role="progressbar"
          aria-label="Locations re-assessed"
          aria-valuemin={0}
          aria-valuemax={total}
          aria-valuenow={done}
          aria-valuetext={`${formatCount(done)} of ${formatCount(total)} locations`}
          className="h-2 w-full overflow-hidden rounded-full border border-accent-500/40 bg-white"
        >
          <div className="h-full bg-accent-700" style={{ width: `${total > 0 ? Math.round((done / total) * 100) : 0}%` }} />
        </div>
        <p className="text-xs text-ink-600">The register updates as it goes; findings on locations not yet reached still reflect the previous settings.</p>
      </section>
    );
  }
  if (job.status === "failed") {
    return (
      <p className="text-xs text-sev-high">
        <span aria-hidden="true">⚠ </span>The last full re-assessment stopped{job.finishedAt ? ` at ${formatDateTime(job.finishedAt)}` : ""} after {formatCount(job.progress)} of{" "}
        {formatCount(job.total ?? 0)} locations{job.error ? `: ${job.error}` : "."}
      </p>
    );
  }
  return job.finishedAt ? <p className="text-xs text-ink-500">Last full re-assessment finished {formatDateTime(job.finishedAt)}.</p> : null;
}
