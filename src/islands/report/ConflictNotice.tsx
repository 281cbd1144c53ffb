import type { Difference } from '../../lib/report-form/conflict';

interface Props {
  who: string | null;
  savedAt: string | null;
  differences: readonly Difference[];
  busy: boolean;
  onKeepMine: () => void;
  onLoadTheirs: () => void;
}

/** Someone saved a newer version: say who and what differs, and let the sonographer choose. */
export function ConflictNotice({ who, savedAt, differences, busy, onKeepMine, onLoadTheirs }: Props) {
  return (
    <div role="alert" className="rounded-card border border-dune-300 bg-dune-50 p-4 text-sm text-ink-900">
      <p className="font-semibold">
        {who ?? 'Someone else'} saved this report{savedAt ? ` at ${savedAt}` : ''}, after your last save.
      </p>
      <p className="mt-1">Your entries are still here and have not been saved. Choose which version to keep.</p>
      {differences.length > 0 && (
        <table className="mt-2 w-full text-left text-xs">
          <caption className="sr-only">Differences between your entries and the saved version</caption>
          <thead>
            <tr className="text-ink-600"><th scope="col" className="py-1 pr-2 font-semibold">Value</th><th scope="col" className="pr-2 font-semibold">Yours</th><th scope="col" className="font-semibold">Saved by {who ?? 'them'}</th></tr>
          </thead>
          <tbody>
            {differences.slice(0, 10).map((d) => (
              <tr key={d.label} className="border-t border-dune-100"><td className="py-1 pr-2">{d.label}</td><td className="pr-2 font-medium">{d.mine}</td><td>{d.theirs}</td></tr>
            ))}
          </tbody>
        </table>
      )}
      {differences.length > 10 && <p className="mt-1 text-xs text-ink-600">and {differences.length - 10} more.</p>}
      <div className="mt-3 flex flex-wrap gap-2">
        <button type="button" className="btn-primary" disabled={busy} onClick={onKeepMine}>Keep mine and save over it</button>
        <button type="button" className="btn-quiet" disabled={busy} onClick={onLoadTheirs}>Load their version</button>
      </div>
    </div>
  );
}
