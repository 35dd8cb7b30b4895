/** A labelled bar; the label says in words what the bar shows. */
export function ProgressBar({ label, done, total }: { label: string; done: number; total: number | null }) {
  const share = total && total > 0 ? Math.min(1, done / total) : 0;
  return (
    <div className="space-y-1">
      <div className="flex justify-between text-sm">
        <span>{label}</span>
        <span className="tabular-nums text-muted">{total ? `${Math.round(share * 100)} %` : "…"}</span>
      </div>
      <div
        role="progressbar"
        aria-label={label}
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={Math.round(share * 100)}
        className="h-3 overflow-hidden rounded-full bg-verdigris-100"
      >
        <div className="h-full bg-verdigris-500 transition-[width]" style={{ width: `${share * 100}%` }} />
      </div>
    </div>
  );
}
