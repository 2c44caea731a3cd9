/**
 * A box that scrolls sideways when its content is wider than a phone's screen. It takes
 * the keyboard focus, so people without a mouse can scroll it with the arrow keys too,
 * and screen readers announce it by its label.
 */
export function ScrollRegion({ label, className = "", children }: { label: string; className?: string; children: React.ReactNode }) {
  return (
    <div role="region" aria-label={label} tabIndex={0} className={`overflow-x-auto ${className}`}>
      {children}
    </div>
  );
}
