/** The caution every page that touches real installations shows. */
export function SimulatorCaution() {
  return (
    <aside
      role="note"
      aria-label="Caution"
      className="rounded-lg border border-l-4 border-copper/40 border-l-copper bg-paper-deep p-3 text-xs text-ink-soft"
    >
      The live console simulates a bench; it does not replace the manufacturer&apos;s installation
      and commissioning instructions, local codes and regulations, or the work of a licensed
      electrician or HVAC technician. Verify on the real installation.
    </aside>
  );
}
