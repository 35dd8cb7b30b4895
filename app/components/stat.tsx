export function Stat({ label, value, hint, tone = "plain" }: {
  label: string;
  value: string;
  hint?: string;
  tone?: "plain" | "alert" | "calm";
}) {
  const toneClass = tone === "alert" ? "text-alert" : tone === "calm" ? "text-verdigris-700" : "text-ink";
  return (
    <div className="rounded-xl border border-line bg-white p-4">
      <dt className="text-sm text-muted">{label}</dt>
      <dd className={`mt-1 text-2xl font-semibold tabular-nums ${toneClass}`}>{value}</dd>
      {hint ? <dd className="mt-1 text-xs text-muted">{hint}</dd> : null}
    </div>
  );
}
