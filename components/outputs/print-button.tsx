"use client";
/** Opens the browser's print dialog (save as PDF there). */
export function PrintButton() {
  return (
    <button type="button" onClick={() => window.print()} className="rounded-card border border-paper-rule bg-paper-raised px-2.5 py-1 text-sm hover:bg-paper-sunk">
      Print or save as PDF
    </button>
  );
}
