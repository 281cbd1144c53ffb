import { zodResolver } from '@hookform/resolvers/zod';
import { deliverySettingsSchema, type DeliverySettingsInput, type ReportDelivery, type SettingState } from '../../lib/schemas/settings';
import { Field } from '../users/Field';
import { SectionCard } from './SectionCard';
import { Switch } from './Switch';
import { useSettingForm } from './useSettingSave';

const toForm = (s: SettingState<ReportDelivery>): DeliverySettingsInput => ({ ...s.value, version: s.version });

/** How final reports reach referring clinicians: the e-mailed link's lifetime and the PDF attachment. */
export function DeliverySection({ initial, timeZone }: { initial: SettingState<ReportDelivery>; timeZone: string }) {
  const { form, card } = useSettingForm<ReportDelivery, DeliverySettingsInput, { setting: SettingState<ReportDelivery> }>({
    path: 'delivery',
    group: 'delivery',
    initial,
    resolver: zodResolver(deliverySettingsSchema),
    toForm,
    failMessage: 'The report delivery settings could not be saved.',
    done: () => 'Report delivery saved.',
  });
  const { register, formState: { errors } } = form;

  return (
    <SectionCard
      {...card}
      id="settings-delivery"
      title="Report delivery"
      description={<p>When a report is signed, the referring clinician gets an e-mail with a link that opens it after signing in.</p>}
      timeZone={timeZone}
      submitLabel="Save report delivery"
    >
      <Field id="link-days" label="Report links work for (days)" hint="1 to 365 days. Links already sent keep the expiry date they were sent with." error={errors.linkDays?.message}>
        <input id="link-days" type="number" inputMode="numeric" min={1} max={365} step={1} className="field-input w-32" {...register('linkDays', { valueAsNumber: true })} aria-invalid={!!errors.linkDays} />
      </Field>
      <Switch
        id="attach-pdf"
        label="Attach the report PDF to the e-mail"
        hint="Off: the e-mail carries only the link. On: the PDF goes with it, so the report travels in the e-mail itself; use it only where referrers’ mailboxes are trusted for patient data."
        {...register('attachPdf')}
      />
      {errors.attachPdf && <p className="field-error" role="alert">{errors.attachPdf.message}</p>}
    </SectionCard>
  );
}
