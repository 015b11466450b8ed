/**
 * Prints the page as a report: the print stylesheet (styles/index.css) leaves out the frame and
 * the controls and keeps the figures, their table headers, the settings line and the cautions.
 */
export function PrintButton({ what = 'this page' }: { what?: string }) {
  return (
    <button type="button" onClick={() => window.print()} className="no-print btn btn-quiet px-3 py-1 text-sm">
      <svg aria-hidden="true" viewBox="0 0 16 16" className="h-4 w-4">
        <path d="M4 6V2h8v4M4 12H2V7h12v5h-2M4 10h8v4H4z" fill="none" stroke="currentColor" strokeWidth="1.4" strokeLinejoin="round" />
      </svg>
      Print {what}
    </button>
  );
}
