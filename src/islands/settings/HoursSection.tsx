import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { hoursSettingsSchema, type BookedOnClosedDate, type ClinicHours, type HoursSettingsInput, type SettingState } from '../../lib/schemas/settings';
import { formatDay } from '../../lib/time';
import { showApiError } from '../forms/api-errors';
import { ClosedDates } from './ClosedDates';
import { SectionCard } from './SectionCard';
import { useSettingSave } from './useSettingSave';
import { WeekdaySessions } from './WeekdaySessions';

// Monday first, as the clinic's week is read; the stored week starts on Sunday (index 0).
const WEEK_ORDER = [1, 2, 3, 4, 5, 6, 0];

const toForm = (s: SettingState<ClinicHours>): HoursSettingsInput => ({ ...structuredClone(s.value), version: s.version });

/** Opening sessions per weekday and closed dates. */
export function HoursSection({ initial, timeZone, today }: { initial: SettingState<ClinicHours>; timeZone: string; today: string }) {
  const s = useSettingSave('hours', 'hours', initial);
  const [stillBooked, setStillBooked] = useState<BookedOnClosedDate[]>([]);
  const {
    control,
    register,
    handleSubmit,
    reset,
    setError,
    setValue,
    watch,
    formState: { errors, isSubmitting, isDirty },
  } = useForm<HoursSettingsInput>({ resolver: zodResolver(hoursSettingsSchema), defaultValues: toForm(initial) });
  const closedDates = watch('closedDates');

  const onSubmit = handleSubmit(async (values) => {
    setStillBooked([]);
    const answer = await s.save<{ setting: SettingState<ClinicHours>; bookedOnClosedDates: BookedOnClosedDate[] }>(values, (e) =>
      showApiError(e, setError, 'The opening hours could not be saved.'),
    );
    if (!answer) return;
    reset(toForm(answer.setting));
    setStillBooked(answer.bookedOnClosedDates);
    s.setNotice('Opening hours saved.');
  });

  return (
    <SectionCard
      id="settings-hours"
      title="Opening hours"
      description={
        <>
          <p>When exams can be booked, in the clinic’s time zone ({timeZone}): up to three sessions a day, for example a morning and an afternoon list.</p>
          <p>Changing the hours never moves or cancels booked exams: they stay where they are, even outside the new hours. New bookings and free-time suggestions follow the new hours.</p>
        </>
      }
      saved={s.saved}
      timeZone={timeZone}
      submitLabel="Save opening hours"
      submitting={isSubmitting}
      dirty={isDirty}
      notice={s.notice}
      stale={s.stale}
      rootError={errors.root?.message}
      onSubmit={onSubmit}
      onLoadSaved={async () => reset(toForm(await s.latest()))}
    >
      {stillBooked.length > 0 && (
        <div role="note" className="rounded-md bg-dune-50 px-3 py-2 text-sm text-dune-700 ring-1 ring-dune-300">
          <p className="font-medium">Exams are still booked on days you have just closed:</p>
          <ul className="mt-1 list-disc pl-5">
            {stillBooked.map((b) => <li key={b.date}>{formatDay(b.date)}: {b.exams} exam{b.exams === 1 ? '' : 's'}</li>)}
          </ul>
          <p className="mt-1">They stay booked. Move or cancel them from the schedule, and let the patients know.</p>
        </div>
      )}
      <div className="divide-y divide-ink-50">
        {WEEK_ORDER.map((day) => <WeekdaySessions key={day} day={day} control={control} register={register} errors={errors} />)}
      </div>
      <ClosedDates
        dates={closedDates}
        today={today}
        errors={errors.closedDates as never}
        onChange={(dates) => setValue('closedDates', dates, { shouldDirty: true })}
      />
    </SectionCard>
  );
}
