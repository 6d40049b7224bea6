"use client";

import { buttonClass } from "@/components/ui/button";

/** Prints the lookup as the one-page technician sheet (the print stylesheet does the layout). */
export function PrintButton() {
  return (
    <button
      type="button"
      className={`no-print ${buttonClass.secondary}`}
      onClick={() => window.print()}
    >
      Print sheet
    </button>
  );
}
