/**
 * The print stylesheet for run reports: only the report on white paper, no
 * navigation or controls, steps kept whole across pages.
 */
export function PrintStyles() {
  return (
    <style>{`
@media print {
  @page { size: A4; margin: 16mm 14mm; }
  html, body { background: #fff !important; }
  aside, nav, [data-print="hide"] { display: none !important; }
  main { background: #fff !important; }
  a { color: inherit; text-decoration: none; }
  details > summary { list-style: none; }
  .break-inside-avoid { break-inside: avoid; }
}
`}</style>
  );
}
