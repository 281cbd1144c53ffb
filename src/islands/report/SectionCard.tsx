import { memo } from 'react';
import type { DerivedValue, Flag, SectionDef } from '../../lib/clinical';
import type { EntryMark } from '../../lib/report-form/form-state';
import type { MeasurementSource } from '../../lib/schemas/reports';
import { measurementKey } from '../../lib/report-form/entries';
import type { FieldActions } from './actions';
import { ChoiceInput } from './ChoiceInput';
import { DerivedList } from './DerivedList';
import { NumberInput } from './NumberInput';

export interface SectionProps {
  section: SectionDef;
  values: Readonly<Record<string, string>>;
  marks: Readonly<Record<string, EntryMark>>;
  sources: Readonly<Record<string, MeasurementSource>>;
  errors: Readonly<Record<string, string>>;
  flags: ReadonlyMap<string, Flag>;
  derived: readonly DerivedValue[];
  required: ReadonlySet<string>;
  waived: Readonly<Record<string, string>>;
  actions: FieldActions;
}

const flagSig = (f: Flag | undefined): string => (f === undefined ? '' : `${f.status}/${f.grade}/${f.range?.text}/${f.adjustment}`);

/**
 * Everything a section shows, as one string: a keystroke in one section leaves every other
 * section's signature, and so its rendering, untouched.
 */
export function sectionSignature(p: SectionProps): string {
  const parts: string[] = [];
  for (const f of p.section.fields) {
    parts.push(f.code, p.values[f.code] ?? '', p.marks[f.code] ?? '', p.sources[f.code] ?? '', p.errors[measurementKey(f.code)] ?? '', flagSig(p.flags.get(f.code)), p.waived[f.code] ?? '');
  }
  for (const d of p.derived) parts.push(d.code, d.display, d.method ?? '', flagSig(p.flags.get(d.code)));
  return parts.join('\u0000');
}

function SectionBody(p: SectionProps & { signature: string }) {
  const { section } = p;
  const headingId = `section-${section.id}`;
  return (
    <section aria-labelledby={headingId} className="card p-4 sm:p-5">
      <h2 id={headingId} className="text-base font-semibold text-ink-900">{section.title}</h2>
      <div className="mt-3 grid gap-x-5 gap-y-4 sm:grid-cols-2 2xl:grid-cols-3">
        {section.fields.map((f) =>
          f.kind === 'number' ? (
            <NumberInput
              key={f.code}
              field={f}
              text={p.values[f.code] ?? ''}
              mark={p.marks[f.code]}
              error={p.errors[measurementKey(f.code)]}
              flag={p.flags.get(f.code)}
              required={p.required.has(f.code)}
              waived={p.waived[f.code] ?? null}
              source={p.sources[f.code]}
              actions={p.actions}
            />
          ) : (
            <ChoiceInput key={f.code} field={f} value={p.values[f.code] ?? ''} error={p.errors[measurementKey(f.code)]} required={p.required.has(f.code)} actions={p.actions} />
          ),
        )}
      </div>
      <DerivedList derived={p.derived} flags={p.flags} />
    </section>
  );
}

/** One template section in scan order; re-renders only when its own signature changes. */
export const SectionCard = memo(SectionBody, (a, b) => a.signature === b.signature && a.actions === b.actions && a.section === b.section);
