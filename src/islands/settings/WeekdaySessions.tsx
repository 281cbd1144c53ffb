import { useFieldArray, useWatch, type Control, type FieldErrors, type UseFormRegister } from 'react-hook-form';
import type { HoursSettingsInput } from '../../lib/schemas/settings';

export const WEEKDAY_NAMES = ['Sunday', 'Monday', 'Tuesday', 'Wednesday', 'Thursday', 'Friday', 'Saturday'] as const;
const MAX_SESSIONS = 3;

const clock = (minutes: number) => `${String(Math.floor(minutes / 60)).padStart(2, '0')}:${String(minutes % 60).padStart(2, '0')}`;
const minutesOf = (hhmm: string) => Number(hhmm.slice(0, 2)) * 60 + Number(hhmm.slice(3, 5));

/** A starting point to edit: 08:00–12:00 on a closed day, else half an hour after the day's latest closing. */
function nextSession(sessions: ReadonlyArray<{ close: string }>): { open: string; close: string } {
  const latest = sessions.map((x) => x.close).filter((c) => /^\d{2}:\d{2}$/.test(c)).sort().at(-1);
  if (!latest) return { open: '08:00', close: '12:00' };
  const open = Math.min(minutesOf(latest) + 30, 23 * 60);
  return { open: clock(open), close: clock(Math.min(open + 180, 23 * 60 + 55)) };
}

interface Props {
  day: number;
  control: Control<HoursSettingsInput>;
  register: UseFormRegister<HoursSettingsInput>;
  errors: FieldErrors<HoursSettingsInput>;
}

/** One weekday's opening sessions (up to three), or "Closed". */
export function WeekdaySessions({ day, control, register, errors }: Props) {
  const { fields, append, remove } = useFieldArray({ control, name: `weekly.${day}` });
  const sessions = useWatch({ control, name: `weekly.${day}` });
  const name = WEEKDAY_NAMES[day];
  const dayErrors = errors.weekly?.[day];
  return (
    <fieldset className="grid gap-2 py-3 sm:grid-cols-[8rem_minmax(0,1fr)]" aria-label={name}>
      <legend className="sr-only">{name}</legend>
      <p className="pt-2 text-sm font-medium text-ink-800" aria-hidden="true">{name}</p>
      <div className="space-y-2">
        {fields.length === 0 && <p className="pt-2 text-sm text-ink-500">Closed</p>}
        {fields.map((field, i) => {
          const e = dayErrors?.[i];
          return (
            <div key={field.id}>
              <div className="flex flex-wrap items-center gap-2">
                <label htmlFor={`hours-${day}-${i}-open`} className="sr-only">{name} session {i + 1} opens</label>
                <input id={`hours-${day}-${i}-open`} type="time" step={300} className="field-input mt-0 w-32" {...register(`weekly.${day}.${i}.open`)} aria-invalid={!!e?.open} />
                <span className="text-sm text-ink-500" aria-hidden="true">to</span>
                <label htmlFor={`hours-${day}-${i}-close`} className="sr-only">{name} session {i + 1} closes</label>
                <input id={`hours-${day}-${i}-close`} type="time" step={300} className="field-input mt-0 w-32" {...register(`weekly.${day}.${i}.close`)} aria-invalid={!!e?.close} />
                <button type="button" className="btn-quiet py-1" onClick={() => remove(i)}>
                  Remove<span className="sr-only"> {name} session {i + 1}</span>
                </button>
              </div>
              {(e?.open || e?.close) && <p className="field-error" role="alert">{e.open?.message ?? e.close?.message}</p>}
            </div>
          );
        })}
        {fields.length < MAX_SESSIONS && (
          <button type="button" className="btn-quiet py-1" onClick={() => append(nextSession(sessions ?? []))}>
            {fields.length === 0 ? 'Open this day' : 'Add a session'}<span className="sr-only"> on {name}</span>
          </button>
        )}
        {dayErrors?.message && <p className="field-error" role="alert">{dayErrors.message}</p>}
      </div>
    </fieldset>
  );
}
