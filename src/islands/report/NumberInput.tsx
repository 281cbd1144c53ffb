import { NOT_DONE, NOT_MEASURABLE, unitSymbol, type Flag, type NumberField } from '../../lib/clinical';
import type { EntryMark } from '../../lib/report-form/form-state';
import { MEASUREMENT_SOURCE_LABELS, type MeasurementSource } from '../../lib/schemas/reports';
import { measurementKey } from '../../lib/report-form/entries';
import { sentence } from '../../lib/report-form/display';
import { fieldDomId } from './fieldIds';
import { FlagBadge } from './FlagBadge';
import { ModeBadge } from './ModeBadge';
import type { FieldActions } from './actions';

interface Props {
  field: NumberField;
  text: string;
  mark: EntryMark | undefined;
  error: string | undefined;
  flag: Flag | undefined;
  required: boolean;
  /** Why the field is not needed now, e.g. "Lobe: Absent (resected or agenesis)". */
  waived: string | null;
  /** Set when no person typed the value: it came from the scanner or the calipers. */
  source?: MeasurementSource | undefined;
  actions: FieldActions;
}

const MARK_PLACEHOLDER = { [NOT_MEASURABLE]: 'not measurable', [NOT_DONE]: 'not done' } as const;

/** One measurement: label with unit and imaging mode, the value, and its state. */
export function NumberInput({ field, text, mark, error, flag, required, waived, source, actions }: Props) {
  const key = measurementKey(field.code);
  const id = fieldDomId(key);
  const unit = unitSymbol(field.unit);
  const describedBy = [`${id}-mode`, source ? `${id}-source` : null, error ? `${id}-error` : null, waived ? `${id}-waived` : null].filter(Boolean).join(' ');
  return (
    <div className="min-w-0">
      <div className="flex items-start justify-between gap-2">
        <label htmlFor={id} className="field-label leading-snug">
          {field.label}
          {required && <span aria-hidden="true" className="ml-0.5 text-high-600">*</span>}
        </label>
        <ModeBadge mode={field.mode} id={`${id}-mode`} />
      </div>
      <div className="mt-1 flex items-stretch gap-1.5">
        <div className="relative min-w-0 flex-1">
          <input
            id={id}
            type="text"
            inputMode="decimal"
            autoComplete="off"
            spellCheck={false}
            data-entry=""
            // The visible unit sits inside the box; the name carries it too ("LVIDd, cm").
            aria-label={`${field.label}, ${unit}`}
            className="field-input mt-0 pr-12 tabular-nums disabled:bg-ink-50 disabled:text-ink-400"
            value={mark === undefined ? text : ''}
            placeholder={mark === undefined ? undefined : MARK_PLACEHOLDER[mark]}
            disabled={mark !== undefined}
            aria-invalid={error ? true : undefined}
            aria-required={required || undefined}
            aria-describedby={describedBy}
            onChange={(e) => actions.value(field.code, e.target.value)}
          />
          <span aria-hidden="true" className="pointer-events-none absolute inset-y-0 right-3 flex items-center text-xs text-ink-500">{unit}</span>
        </div>
        <select
          aria-label={`${field.label}: state`}
          className="w-[6.5rem] shrink-0 rounded-md border border-ink-200 bg-white px-1.5 text-xs text-ink-700 focus:border-crest-500 focus:ring-2 focus:ring-crest-200 focus:outline-none"
          value={mark ?? 'value'}
          onChange={(e) => actions.mark(field.code, e.target.value === 'value' ? null : (e.target.value as EntryMark))}
        >
          <option value="value">Value</option>
          <option value={NOT_MEASURABLE}>Not measurable</option>
          <option value={NOT_DONE}>Not done</option>
        </select>
      </div>
      {flag && (
        <div className="mt-1">
          <FlagBadge flag={flag} />
        </div>
      )}
      {source && mark === undefined && (
        <p id={`${id}-source`} className="mt-1 text-xs font-medium text-crest-700" data-testid={`source-${field.code}`}>
          {MEASUREMENT_SOURCE_LABELS[source].replace(/^./, (c) => c.toUpperCase())}; typing over it makes it yours.
        </p>
      )}
      {waived && <p id={`${id}-waived`} className="mt-1 text-xs text-ink-500">Not needed: {waived}</p>}
      {error && (
        <p id={`${id}-error`} className="field-error text-xs" role="alert">
          {sentence(error)}
        </p>
      )}
    </div>
  );
}
