'use client';
/** Opens the browser's print dialog (pages carry print styles: navigation and controls are hidden). */
export function PrintButton({ label = 'Print or save as PDF' }: { label?: string }) {
  return (
    <button type="button" className="btn-quiet" onClick={() => window.print()}>
      {label}
    </button>
  );
}
