const LABELS = { pending: "Waiting to send", sent: "Sent", failed: "Not delivered" } as const;
const STYLES = {
  pending: "bg-amber-50 text-ink ring-watch",
  sent: "bg-verdigris-100 text-verdigris-900 ring-verdigris-500",
  failed: "bg-orange-50 text-alert ring-alert",
} as const;

export function MailStatusBadge({ status, attempts }: { status: keyof typeof LABELS; attempts: number }) {
  const tries = status !== "sent" && attempts > 0 ? ` · ${attempts} ${attempts === 1 ? "try" : "tries"}` : "";
  return (
    <span className={`rounded-full px-2 py-1 text-sm font-medium ring-1 ${STYLES[status]}`}>
      {LABELS[status]}
      {tries}
    </span>
  );
}
