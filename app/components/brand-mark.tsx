/** Sinewright's mark: one cycle of a sine drawn over a stepped wave, in a rounded square. */
export function BrandMark({ size = 28 }: { size?: number }) {
  return (
    <svg width={size} height={size} viewBox="0 0 32 32" aria-hidden="true" focusable="false">
      <rect x="1" y="1" width="30" height="30" rx="7" fill="var(--color-copper)" />
      <path d="M5 16 H8 V10 H12 V7 H20 V10 H24 V16" fill="none" stroke="#f3d9c6" strokeWidth="1.4" strokeLinejoin="round" />
      <path d="M8 16 V22 H12 V25 H20 V22 H24 V16 H27" fill="none" stroke="#f3d9c6" strokeWidth="1.4" strokeLinejoin="round" />
      <path d="M5 16 C9 4, 12 4, 16 16 S 23 28, 27 16" fill="none" stroke="#fff" strokeWidth="2.2" strokeLinecap="round" />
    </svg>
  );
}

export function Wordmark() {
  return (
    <span className="inline-flex items-center gap-2">
      <BrandMark />
      <span className="font-serif text-lg font-semibold tracking-tight text-ink">Sinewright</span>
    </span>
  );
}
