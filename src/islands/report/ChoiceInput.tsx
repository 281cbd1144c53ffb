import type { ChoiceField } from '../../lib/clinical';
import { measurementKey } from '../../lib/report-form/entries';
import { sentence } from '../../lib/report-form/display';
import type { FieldActions } from './actions';
import { fieldDomId } from './fieldIds';
import { ModeBadge } from './ModeBadge';

interface Props {
  field: ChoiceField;
  value: string;
  error: string | undefined;
  required: boolean;
  actions: FieldActions;
}

/** A single-choice field as a radio group; "Clear" returns it to not recorded. */
export function ChoiceInput({ field, value, error, required, actions }: Props) {
  const key = measurementKey(field.code);
  const id = fieldDomId(key);
  const chosen = field.options.findIndex((o) => o.value === value);
  return (
    <div
      role="radiogroup"
      className="min-w-0"
      aria-labelledby={`${id}-label`}
      aria-describedby={error ? `${id}-error` : undefined}
      aria-invalid={error ? true : undefined}
      aria-required={required || undefined}
    >
      <div className="flex items-start justify-between gap-2">
        <span id={`${id}-label`} className="field-label leading-snug">
          {field.label}
          {required && <span aria-hidden="true" className="ml-0.5 text-high-600">*</span>}
        </span>
        {field.mode && <ModeBadge mode={field.mode} />}
      </div>
      <div className="mt-1 flex flex-wrap items-center gap-1.5">
        {field.options.map((o, i) => (
          <label
            key={o.value}
            className="inline-flex cursor-pointer items-center gap-1.5 rounded-md px-2.5 py-1.5 text-sm ring-1 ring-ink-200 ring-inset has-checked:bg-crest-50 has-checked:font-medium has-checked:text-crest-800 has-checked:ring-crest-400 has-focus-visible:outline-2 has-focus-visible:outline-offset-2 has-focus-visible:outline-crest-500"
          >
            <input
              type="radio"
              className="accent-crest-600"
              name={id}
              value={o.value}
              // The checked radio (or the first) is the group's entry point for Enter and for a 422.
              id={i === Math.max(chosen, 0) ? id : undefined}
              data-entry=""
              checked={value === o.value}
              onChange={() => actions.value(field.code, o.value)}
            />
            {o.label}
          </label>
        ))}
        {value !== '' && (
          <button type="button" className="px-1.5 text-xs font-medium text-ink-500 underline-offset-2 hover:underline" onClick={() => actions.value(field.code, '')}>
            Clear<span className="sr-only"> {field.label}</span>
          </button>
        )}
      </div>
      {error && (
        <p id={`${id}-error`} className="field-error text-xs" role="alert">
          {sentence(error)}
        </p>
      )}
    </div>
  );
}
