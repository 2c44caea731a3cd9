/** Opens the browser's print dialog; the print stylesheet turns the sheet into a calculation document. */
export function PrintButton() {
  return (
    <button type="button" className="btn btn-quiet print:hidden" onClick={() => window.print()}>
      Print / save as PDF
    </button>
  );
}
