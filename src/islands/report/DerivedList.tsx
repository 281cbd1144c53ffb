import type { DerivedValue, Flag } from '../../lib/clinical';
import { derivedMethodText } from '../../lib/report-form/display';
import { FlagBadge } from './FlagBadge';

/** Calculated values of one section, as the engine returned them, each with its flag. */
export function DerivedList({ derived, flags }: { derived: readonly DerivedValue[]; flags: ReadonlyMap<string, Flag> }) {
  if (derived.length === 0) return null;
  return (
    <div className="mt-4 rounded-md bg-crest-50/60 px-3 py-2 ring-1 ring-crest-100">
      <p className="text-xs font-semibold tracking-wide text-crest-800 uppercase">Calculated</p>
      <dl className="mt-1 grid gap-x-6 gap-y-2 sm:grid-cols-2">
        {derived.map((d) => {
          const flag = flags.get(d.code);
          const method = derivedMethodText(d);
          return (
            <div key={d.code} data-testid={`derived-${d.code}`} className="min-w-0">
              <dt className="text-xs text-ink-600">{d.label}</dt>
              <dd className="flex flex-wrap items-center gap-x-2 gap-y-1">
                <span className="text-base font-semibold text-ink-900 tabular-nums" data-value="">{d.display}</span>
                {flag && <FlagBadge flag={flag} />}
                {method && <span className="block w-full text-[0.6875rem] text-ink-500">{method}</span>}
              </dd>
            </div>
          );
        })}
      </dl>
    </div>
  );
}
