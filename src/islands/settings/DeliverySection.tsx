import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { deliverySettingsSchema, type DeliverySettingsInput, type ReportDelivery, type SettingState } from '../../lib/schemas/settings';
import { showApiError } from '../forms/api-errors';
import { Field } from '../users/Field';
import { SectionCard } from './SectionCard';
import { Switch } from './Switch';
import { useSettingSave } from './useSettingSave';

const toForm = (s: SettingState<ReportDelivery>): DeliverySettingsInput => ({ ...s.value, version: s.version });

/** How final reports reach referring clinicians: the e-mailed link's lifetime and the PDF attachment. */
export function DeliverySection({ initial, timeZone }: { initial: SettingState<ReportDelivery>; timeZone: string }) {
  const s = useSettingSave('delivery', 'delivery', initial);
  const {
    register,
    handleSubmit,
    reset,
    setError,
    formState: { errors, isSubmitting, isDirty },
  } = useForm<DeliverySettingsInput>({ resolver: zodResolver(deliverySettingsSchema), defaultValues: toForm(initial) });

  const onSubmit = handleSubmit(async (values) => {
    const answer = await s.save<{ setting: SettingState<ReportDelivery> }>(values, (e) => showApiError(e, setError, 'The report delivery settings could not be saved.'));
    if (!answer) return;
    reset(toForm(answer.setting));
    s.setNotice('Report delivery saved.');
  });

  return (
    <SectionCard
      id="settings-delivery"
      title="Report delivery"
      description={<p>When a report is signed, the referring clinician gets an e-mail with a link that opens it after signing in.</p>}
      saved={s.saved}
      timeZone={timeZone}
      submitLabel="Save report delivery"
      submitting={isSubmitting}
      dirty={isDirty}
      notice={s.notice}
      stale={s.stale}
      rootError={errors.root?.message}
      onSubmit={onSubmit}
      onLoadSaved={async () => reset(toForm(await s.latest()))}
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
