/**
 * Small marks that sit beside words (never instead of them): the words carry the
 * meaning, the shape helps the eye, colour comes last.
 */
const common = { width: 14, height: 14, viewBox: "0 0 16 16", "aria-hidden": true, focusable: false } as const;

export function PassMark({ className = "" }: { className?: string }) {
  return (
    <svg {...common} className={`inline-block shrink-0 ${className}`}>
      <circle cx="8" cy="8" r="7" fill="none" stroke="currentColor" strokeWidth="1.5" />
      <path d="M4.6 8.3 7 10.6l4.4-5" fill="none" stroke="currentColor" strokeWidth="1.7" strokeLinecap="round" strokeLinejoin="round" />
    </svg>
  );
}

export function OverMark({ className = "" }: { className?: string }) {
  return (
    <svg {...common} className={`inline-block shrink-0 ${className}`}>
      <rect x="1" y="1" width="14" height="14" rx="2" fill="none" stroke="currentColor" strokeWidth="1.5" />
      <path d="m5 5 6 6M11 5l-6 6" stroke="currentColor" strokeWidth="1.7" strokeLinecap="round" />
    </svg>
  );
}

export function WarningMark({ className = "" }: { className?: string }) {
  return (
    <svg {...common} className={`inline-block shrink-0 ${className}`}>
      <path d="M8 1.5 15 14H1z" fill="none" stroke="currentColor" strokeWidth="1.5" strokeLinejoin="round" />
      <path d="M8 6v3.6" stroke="currentColor" strokeWidth="1.7" strokeLinecap="round" />
      <circle cx="8" cy="11.8" r="0.9" fill="currentColor" />
    </svg>
  );
}
