import { HARDWARE_CAUTION } from "~/lib/cautions";

/** The safety caution shown wherever results guide hardware. */
export function HardwareCaution({ compact = false }: { compact?: boolean }) {
  return (
    <aside
      aria-label="Safety caution"
      className={`rounded-md border border-[#e3cf8f] bg-waiting-wash text-[#5e480a] ${compact ? "px-3 py-2 text-xs" : "px-4 py-3 text-sm"}`}
    >
      <strong className="font-semibold">Caution — lethal voltages.</strong> {HARDWARE_CAUTION}
    </aside>
  );
}
