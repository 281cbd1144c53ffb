import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { cancellationSettingsSchema, type CancellationSettingsInput, type PaymentPolicy, type SettingState } from '../../lib/schemas/settings';
import { showApiError } from '../forms/api-errors';
import { Field } from '../users/Field';
import { SectionCard } from './SectionCard';
import { useSettingSave } from './useSettingSave';

const toForm = (s: SettingState<PaymentPolicy>): CancellationSettingsInput => ({ ...s.value, version: s.version });

/** The refund window: cancelled early enough, the patient gets everything back. */
export function CancellationSection({ initial, timeZone }: { initial: SettingState<PaymentPolicy>; timeZone: string }) {
  const s = useSettingSave('cancellations', 'cancellations', initial);
  const {
    register,
    handleSubmit,
    reset,
    setError,
    formState: { errors, isSubmitting, isDirty },
  } = useForm<CancellationSettingsInput>({ resolver: zodResolver(cancellationSettingsSchema), defaultValues: toForm(initial) });

  const onSubmit = handleSubmit(async (values) => {
    const answer = await s.save<{ setting: SettingState<PaymentPolicy> }>(values, (e) => showApiError(e, setError, 'The cancellation policy could not be saved.'));
    if (!answer) return;
    reset(toForm(answer.setting));
    s.setNotice('Cancellation policy saved.');
  });

  return (
    <SectionCard
      id="settings-cancellations"
      title="Cancellations"
      description={<p>A patient who cancels at least this long before the exam gets everything back; a later cancellation keeps the deposit. A change applies to cancellations from now on; refunds already made stay as they were.</p>}
      saved={s.saved}
      timeZone={timeZone}
      submitLabel="Save cancellation policy"
      submitting={isSubmitting}
      dirty={isDirty}
      notice={s.notice}
      stale={s.stale}
      rootError={errors.root?.message}
      onSubmit={onSubmit}
      onLoadSaved={async () => reset(toForm(await s.latest()))}
    >
      <Field id="refund-hours" label="Full refund window (hours before the exam)" hint="0 to 720 hours; 48 means two days ahead." error={errors.fullRefundHoursAhead?.message}>
        <input id="refund-hours" type="number" inputMode="numeric" min={0} max={720} step={1} className="field-input w-32" {...register('fullRefundHoursAhead', { valueAsNumber: true })} aria-invalid={!!errors.fullRefundHoursAhead} />
      </Field>
    </SectionCard>
  );
}
