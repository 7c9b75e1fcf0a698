/** The caution every page that touches real installations carries. */
export function SimulatorCaution() {
  return (
    <div
      role="note"
      aria-label="Caution"
      className="rounded-lg border border-copper/40 border-l-4 border-l-copper bg-paper-deep p-4 text-sm break-inside-avoid"
    >
      <p className="font-semibold">Caution</p>
      <p className="mt-1 text-ink-soft">
        This report comes from a simulation. The simulator does not replace the manufacturer&apos;s
        installation and commissioning instructions, local codes and regulations, or the work of a
        licensed electrician or HVAC technician. Verify every result on the real installation.
      </p>
    </div>
  );
}
