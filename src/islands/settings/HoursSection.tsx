import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { hoursSettingsSchema, type BookedOnClosedDate, type ClinicHours, type HoursSettingsInput, type SettingState } from '../../lib/schemas/settings';
import { formatDay } from '../../lib/time';
import { ClosedDates } from './ClosedDates';
import { SectionCard } from './SectionCard';
import { useSettingForm } from './useSettingSave';
import { WeekdaySessions } from './WeekdaySessions';

// Monday first, as the clinic's week is read; the stored week starts on Sunday (index 0).
const WEEK_ORDER = [1, 2, 3, 4, 5, 6, 0];

const toForm = (s: SettingState<ClinicHours>): HoursSettingsInput => ({ ...structuredClone(s.value), version: s.version });

/** Opening sessions per weekday and closed dates. */
export function HoursSection({ initial, timeZone, today }: { initial: SettingState<ClinicHours>; timeZone: string; today: string }) {
  const [stillBooked, setStillBooked] = useState<BookedOnClosedDate[]>([]);
  const { form, card } = useSettingForm<ClinicHours, HoursSettingsInput, { setting: SettingState<ClinicHours>; bookedOnClosedDates: BookedOnClosedDate[] }>({
    path: 'hours',
    group: 'hours',
    initial,
    resolver: zodResolver(hoursSettingsSchema),
    toForm,
    failMessage: 'The opening hours could not be saved.',
    beforeSave: () => setStillBooked([]),
    done: (answer) => {
      setStillBooked(answer.bookedOnClosedDates);
      return 'Opening hours saved.';
    },
  });
  const { control, register, setValue, watch, formState: { errors } } = form;
  const closedDates = watch('closedDates');

  return (
    <SectionCard
      {...card}
      id="settings-hours"
      title="Opening hours"
      description={
        <>
          <p>When exams can be booked, in the clinic’s time zone ({timeZone}): up to three sessions a day, for example a morning and an afternoon list.</p>
          <p>Changing the hours never moves or cancels booked exams: they stay where they are, even outside the new hours. New bookings and free-time suggestions follow the new hours.</p>
        </>
      }
      timeZone={timeZone}
      submitLabel="Save opening hours"
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
