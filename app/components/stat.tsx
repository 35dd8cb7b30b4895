export function Stat({ label, value, hint, tone = "plain" }: {
  label: string;
  value: string;
  hint?: string;
  tone?: "plain" | "alert" | "calm";
}) {
  // A figure to act on carries a triangle beside its label; a calm one is plain (no good-green beside alert-orange).
  const toneClass = tone === "alert" ? "text-alert" : "text-ink";
  return (
    <div className="rounded-xl border border-line bg-white p-4" data-state={tone === "alert" ? "above" : "fine"}>
      <dt className="text-sm text-muted">
        {tone === "alert" ? (
          <span aria-hidden="true" className="mr-1 text-alert">
            ▲
          </span>
        ) : null}
        {label}
      </dt>
      <dd className={`mt-1 text-2xl font-semibold tabular-nums ${toneClass}`}>{value}</dd>
      {hint ? <dd className="mt-1 text-xs text-muted">{hint}</dd> : null}
    </div>
  );
}
