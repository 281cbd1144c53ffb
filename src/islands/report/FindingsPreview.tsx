import { memo } from 'react';

/** The findings sentences the engine drafts from the current entries. */
export const FindingsPreview = memo(function FindingsPreview({ findings }: { findings: readonly string[] }) {
  return (
    <section aria-labelledby="findings-heading" className="card p-4">
      <h2 id="findings-heading" className="text-sm font-semibold text-ink-700">Findings (draft, generated)</h2>
      {findings.length === 0 ? (
        <p className="mt-2 text-sm text-ink-500">Findings appear as values are entered.</p>
      ) : (
        <ul className="mt-2 space-y-1.5 text-sm leading-snug text-ink-800" data-testid="findings-preview">
          {findings.map((s, i) => <li key={i}>{s}</li>)}
        </ul>
      )}
    </section>
  );
}, (a, b) => a.findings.join('\n') === b.findings.join('\n'));
