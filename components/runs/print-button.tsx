"use client";

import { Button } from "@/components/ui/button";

/** Opens the browser's print dialog; the page's print stylesheet does the rest. */
export function PrintButton() {
  return (
    <Button variant="secondary" onClick={() => window.print()}>
      Print or save as PDF
    </Button>
  );
}
