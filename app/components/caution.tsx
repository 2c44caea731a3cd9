/** The safety caution shown wherever results guide hardware. */
export function HardwareCaution({ compact = false }: { compact?: boolean }) {
  return (
    <aside
      aria-label="Safety caution"
      className={`rounded-md border border-[#e3cf8f] bg-waiting-wash text-[#5e480a] ${compact ? "px-3 py-2 text-xs" : "px-4 py-3 text-sm"}`}
    >
      <strong className="font-semibold">Caution — lethal voltages.</strong> Inverter DC links and outputs can kill, and grid-tied
      equipment must meet its interconnection rules. These calculations support, and never replace, the applicable standards,
      local electrical codes and review by a licensed or otherwise qualified engineer.
    </aside>
  );
}
