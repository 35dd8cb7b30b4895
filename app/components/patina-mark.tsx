export function PatinaMark({ className = "size-8" }: { className?: string }) {
  return (
    <svg viewBox="0 0 32 32" className={className} aria-hidden="true">
      <rect width="32" height="32" rx="8" fill="#22604f" />
      <path d="M6 20c3-3 6-3 10 0s7 3 10 0" fill="none" stroke="#d3ebe3" strokeWidth="3" strokeLinecap="round" />
      <circle cx="16" cy="11" r="3.5" fill="#b3541e" />
    </svg>
  );
}
