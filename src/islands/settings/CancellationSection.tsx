import { zodResolver } from '@hookform/resolvers/zod';
import { cancellationSettingsSchema, type CancellationSettingsInput, type PaymentPolicy, type SettingState } from '../../lib/schemas/settings';
import { Field } from '../users/Field';
import { SectionCard } from './SectionCard';
import { useSettingForm } from './useSettingSave';

const toForm = (s: SettingState<PaymentPolicy>): CancellationSettingsInput => ({ ...s.value, version: s.version });

/** The refund window: cancelled early enough, the patient gets everything back. */
export function CancellationSection({ initial, timeZone }: { initial: SettingState<PaymentPolicy>; timeZone: string }) {
  const { form, card } = useSettingForm<PaymentPolicy, CancellationSettingsInput, { setting: SettingState<PaymentPolicy> }>({
    path: 'cancellations',
    group: 'cancellations',
    initial,
    resolver: zodResolver(cancellationSettingsSchema),
    toForm,
    failMessage: 'The cancellation policy could not be saved.',
    done: () => 'Cancellation policy saved.',
  });
  const { register, formState: { errors } } = form;

  return (
    <SectionCard
      {...card}
      id="settings-cancellations"
      title="Cancellations"
      description={<p>A patient who cancels at least this long before the exam gets everything back; a later cancellation keeps the deposit. A change applies to cancellations from now on; refunds already made stay as they were.</p>}
      timeZone={timeZone}
      submitLabel="Save cancellation policy"
    >
      <Field id="refund-hours" label="Full refund window (hours before the exam)" hint="0 to 720 hours; 48 means two days ahead." error={errors.fullRefundHoursAhead?.message}>
        <input id="refund-hours" type="number" inputMode="numeric" min={0} max={720} step={1} className="field-input w-32" {...register('fullRefundHoursAhead', { valueAsNumber: true })} aria-invalid={!!errors.fullRefundHoursAhead} />
      </Field>
    </SectionCard>
  );
}
