/**
 * The frame of the inspector's tools that open under a stage's form (Solve from targets, Insert a
 * low-pass filter): a titled section with a Close button, and a two-column form of labelled fields
 * that runs the tool on Enter or on its submit button.
 */
export function ToolPanel({ testId, label, title, onClose, children }: { testId: string; label: string; title: string; onClose: () => void; children: React.ReactNode }) {
  return (
    <section className="flex flex-col gap-2 border-t border-paper-rule pt-2" data-testid={testId} aria-label={label}>
      <div className="flex items-center justify-between">
        <h3 className="text-[12px] font-semibold uppercase tracking-wide text-graphite-500">{title}</h3>
        <button type="button" onClick={onClose} className="text-[12px] text-graphite-500 hover:text-graphite-900">
          Close
        </button>
      </div>
      {children}
    </section>
  );
}

export function ToolForm({ onSubmit, children }: { onSubmit: () => void; children: React.ReactNode }) {
  return (
    <form
      className="grid grid-cols-[6.5rem_1fr] items-center gap-x-2 gap-y-1"
      onSubmit={(e) => {
        e.preventDefault();
        onSubmit();
      }}
    >
      {children}
    </form>
  );
}
