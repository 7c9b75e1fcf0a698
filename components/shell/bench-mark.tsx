/** Benchline's mark: two copper bus-bars joined by two taps. Decorative. */
export function BenchMark({ className }: { className?: string }) {
  return (
    <svg viewBox="0 0 32 32" aria-hidden="true" className={className}>
      <rect x="3" y="8" width="26" height="3" rx="1.5" className="fill-copper-bright" />
      <rect x="3" y="21" width="26" height="3" rx="1.5" className="fill-copper-bright" />
      <rect x="9" y="11" width="2" height="10" className="fill-graphite-text" />
      <rect x="21" y="11" width="2" height="10" className="fill-teal-bright" />
    </svg>
  );
}
