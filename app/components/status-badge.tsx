/** A revision's review state in our own words, with a shape as well as a colour. */
const LOOK: Record<string, { label: string; className: string; mark: string }> = {
  unsaved: { label: "Not saved yet", className: "border-rule-strong text-ink-faint", mark: "○" },
  draft: { label: "Draft", className: "border-rule-strong text-ink-soft", mark: "◇" },
  submitted: { label: "Awaiting check", className: "border-[#d9bf6a] bg-waiting-wash text-[#5e480a]", mark: "◔" },
  returned: { label: "Returned", className: "border-[#e2b4b0] bg-danger-wash text-danger", mark: "↩" },
  verified: { label: "Verified", className: "border-[#9fc39a] bg-verified-wash text-verified", mark: "✓" },
};

export function StatusBadge({ status }: { status: string }) {
  const look = LOOK[status] ?? LOOK.draft!;
  return (
    <span className={`inline-flex w-fit items-center gap-1 self-start whitespace-nowrap rounded-full border px-2 py-0.5 text-xs font-medium ${look.className}`}>
      <span aria-hidden="true">{look.mark}</span>
      {look.label}
    </span>
  );
}

export function statusLabel(status: string): string {
  return (LOOK[status] ?? LOOK.draft!).label;
}
