import { zodResolver } from '@hookform/resolvers/zod';
import type { ClinicProfile } from '../../lib/schemas/clinic';
import { clinicSettingsSchema, type ClinicSettingsInput, type SettingState } from '../../lib/schemas/settings';
import { Field } from '../users/Field';
import { SectionCard } from './SectionCard';
import { useSettingForm } from './useSettingSave';

const ADDRESS_LINES = 4;

function toForm(s: SettingState<ClinicProfile>): ClinicSettingsInput {
  const { currency: _currency, ...profile } = s.value;
  const lines = [...profile.addressLines, ...Array<string>(ADDRESS_LINES).fill('')].slice(0, ADDRESS_LINES);
  return { ...profile, addressLines: lines, version: s.version };
}

/** The clinic's name, address, contact details and time zone. */
export function ClinicSection({ initial, timeZones, timeZone }: { initial: SettingState<ClinicProfile>; timeZones: string[]; timeZone: string }) {
  const { saved, form, card } = useSettingForm<ClinicProfile, ClinicSettingsInput, { setting: SettingState<ClinicProfile> }>({
    path: 'clinic',
    group: 'clinic',
    initial,
    resolver: zodResolver(clinicSettingsSchema),
    toForm,
    failMessage: 'The clinic profile could not be saved.',
    done: () => 'Clinic profile saved.',
  });
  const { register, watch, formState: { errors } } = form;
  const chosenZone = watch('timeZone');

  return (
    <SectionCard
      {...card}
      id="settings-clinic"
      title="Clinic"
      description={<p>How the clinic is named on screens, letters, e-mails and report PDFs, and the time zone its days and clock times are shown in.</p>}
      timeZone={timeZone}
      submitLabel="Save clinic profile"
    >
      <div className="grid gap-4 sm:grid-cols-2">
        <Field id="clinic-name" label="Clinic name" error={errors.name?.message}>
          <input id="clinic-name" className="field-input" autoComplete="organization" {...register('name')} aria-invalid={!!errors.name} />
        </Field>
        <Field id="clinic-email" label="E-mail" hint="Shown to patients and referrers as the clinic’s address." error={errors.email?.message}>
          <input id="clinic-email" type="email" className="field-input" {...register('email')} aria-invalid={!!errors.email} />
        </Field>
        <Field id="clinic-phone" label="Phone" error={errors.phone?.message}>
          <input id="clinic-phone" type="tel" className="field-input" {...register('phone')} aria-invalid={!!errors.phone} />
        </Field>
        <div>
          <p className="field-label">Currency</p>
          <p className="mt-1 py-2 text-sm text-ink-700">{initial.value.currency} <span className="text-xs text-ink-500">(prices and payments are kept in it; not changed here)</span></p>
        </div>
      </div>
      <fieldset>
        <legend className="field-label">Address</legend>
        <div className="mt-1 grid gap-2 sm:grid-cols-2">
          {Array.from({ length: ADDRESS_LINES }, (_, i) => (
            <div key={i}>
              <label htmlFor={`clinic-address-${i}`} className="sr-only">Address line {i + 1}</label>
              <input id={`clinic-address-${i}`} className="field-input mt-0" placeholder={i === 0 ? 'Street and number' : ''} {...register(`addressLines.${i}`)} aria-invalid={!!errors.addressLines?.[i]} />
              {errors.addressLines?.[i] && <p className="field-error" role="alert">{errors.addressLines[i]?.message}</p>}
            </div>
          ))}
        </div>
      </fieldset>
      <Field id="clinic-time-zone" label="Time zone" hint="Times are stored in UTC; the time zone decides how they are shown and which day is “today”." error={errors.timeZone?.message}>
        <select id="clinic-time-zone" className="field-input max-w-sm" {...register('timeZone')} aria-invalid={!!errors.timeZone}>
          {timeZones.map((tz) => <option key={tz} value={tz}>{tz.replaceAll('_', ' ')}</option>)}
        </select>
      </Field>
      {chosenZone !== saved.value.timeZone && (
        <p role="note" className="rounded-md bg-dune-50 px-3 py-2 text-sm text-dune-700 ring-1 ring-dune-300">
          Changing the time zone from {saved.value.timeZone} to {chosenZone} changes only how times are shown. Every booking, report and payment keeps its stored moment (in UTC), so an exam booked for 09:00 will show at a different clock time if the zones differ, and “today” on the worklist starts at the new zone’s midnight. Nothing is moved or rewritten.
        </p>
      )}
    </SectionCard>
  );
}
