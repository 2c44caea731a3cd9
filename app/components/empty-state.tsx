/** What a list shows when it has nothing yet: what will appear here, and what to do next. */
export function EmptyState({ title, children, action }: { title: string; children: React.ReactNode; action?: React.ReactNode }) {
  return (
    <div className="panel flex flex-col items-start gap-3 border-dashed px-6 py-10 sm:items-center sm:text-center">
      <svg width="56" height="32" viewBox="0 0 56 32" aria-hidden="true" className="text-rule-strong">
        <path d="M2 16 H10 V6 H22 V16 H34 V26 H46 V16 H54" fill="none" stroke="currentColor" strokeWidth="1.5" />
        <path d="M2 16 C12 -2, 18 -2, 28 16 S 44 34, 54 16" fill="none" stroke="var(--color-copper)" strokeWidth="2" />
      </svg>
      <h2 className="font-serif text-xl font-semibold">{title}</h2>
      <div className="max-w-lg text-sm text-ink-soft">{children}</div>
      {action}
    </div>
  );
}

export function PageHeader({ eyebrow, title, children }: { eyebrow: string; title: string; children?: React.ReactNode }) {
  return (
    <header className="mb-6 flex flex-col gap-3 sm:flex-row sm:items-end sm:justify-between">
      <div>
        <p className="eyebrow">{eyebrow}</p>
        <h1 className="mt-1 font-serif text-3xl font-semibold">{title}</h1>
      </div>
      {children}
    </header>
  );
}
