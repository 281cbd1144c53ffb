import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { DEFAULT_PROBE, PROBE_KINDS } from '../../lib/clinical/probes';
import type { TemplateId } from '../../lib/clinical/types';
import { PROBE_KIND_CODES } from '../../lib/exam-status';
import { examTypeFormSchema, textFromCents, type ExamTypeFields, type ExamTypeFormValues, type ExamTypeRow } from '../../lib/schemas/catalog-admin';
import { Field, FormButtons, FormHead, invalid } from './Field';
import { useSaveRow } from './useSaveRow';

export interface TemplateChoice {
  id: string;
  title: string;
}

interface Props {
  row?: ExamTypeRow;
  templates: TemplateChoice[];
  currency: string;
  onDone: (message: string) => void;
  onCancel: () => void;
}

/**
 * Adds or edits an exam type. Prices are typed in currency units and sent as cents; a new price
 * applies to bookings made from now on, never to exams already booked.
 */
export function ExamTypeForm({ row, templates, currency, onDone, onCancel }: Props) {
  const p = row ? `exam-type-${row.id}` : 'exam-type-new';
  const title = row ? `Edit ${row.name}` : 'New exam type';
  // Once exams use the type their reports follow its template: the server refuses a change, so the form offers none.
  const templateFixed = !!row && row.examCount > 0;
  const {
    register,
    handleSubmit,
    setError,
    setValue,
    formState: { errors },
  } = useForm<ExamTypeFormValues, unknown, ExamTypeFields>({
    resolver: zodResolver(examTypeFormSchema),
    defaultValues: {
      name: row?.name ?? '',
      templateId: row?.templateId ?? templates[0]?.id ?? '',
      durationMinutes: String(row?.durationMinutes ?? 30),
      probeKind: row?.probeKind ?? DEFAULT_PROBE[(templates[0]?.id ?? 'thyroid') as TemplateId] ?? 'linear',
      preparationText: row?.preparationText ?? '',
      selfPayPriceCents: row ? textFromCents(row.selfPayPriceCents) : '',
      depositCents: row ? textFromCents(row.depositCents) : '',
    },
  });
  const { submit, saving } = useSaveRow('exam-types', row, setError);
  const templateField = register('templateId', {
    // A new template suggests its usual probe (thyroid → linear, abdomen → curvilinear, echo → phased array).
    onChange: (e: { target: { value: string } }) => {
      const probe = DEFAULT_PROBE[e.target.value as TemplateId];
      if (probe) setValue('probeKind', probe);
    },
  });

  return (
    <form
      className="card grid gap-4 p-5 sm:grid-cols-2"
      noValidate
      aria-label={title}
      onSubmit={handleSubmit((v) => submit(v, (saved) => onDone(row ? `Changes to ${saved.name} saved.` : `${saved.name} added; it can be booked now.`)))}
    >
      <FormHead title={title} problem={errors.root?.message} />
      <Field id={`${p}-name`} label="Name" hint="As the booking form, the e-mails and the worklist show it." error={errors.name?.message}>
        <input id={`${p}-name`} className="field-input" autoComplete="off" {...register('name')} {...invalid(`${p}-name`, errors.name)} />
      </Field>
      <Field id={`${p}-template`} label="Report template" hint={templateFixed ? `Fixed: ${row!.examCount} exam${row!.examCount === 1 ? '' : 's'} use this type.` : undefined} error={errors.templateId?.message}>
        {templateFixed ? (
          <p id={`${p}-template`} className="mt-1 py-2 text-sm text-ink-800">{templates.find((t) => t.id === row!.templateId)?.title ?? row!.templateId}</p>
        ) : (
          <select id={`${p}-template`} className="field-input" {...templateField} {...invalid(`${p}-template`, errors.templateId)}>
            {templates.map((t) => <option key={t.id} value={t.id}>{t.title}</option>)}
          </select>
        )}
      </Field>
      <Field id={`${p}-duration`} label="Duration (minutes)" hint="5 to 240; exams already booked keep theirs." error={errors.durationMinutes?.message}>
        <input id={`${p}-duration`} type="number" inputMode="numeric" min={5} max={240} step={5} className="field-input" {...register('durationMinutes')} {...invalid(`${p}-duration`, errors.durationMinutes)} />
      </Field>
      <Field id={`${p}-probe`} label="Default probe kind" error={errors.probeKind?.message}>
        <select id={`${p}-probe`} className="field-input" {...register('probeKind')} {...invalid(`${p}-probe`, errors.probeKind)}>
          {PROBE_KIND_CODES.map((k) => <option key={k} value={k}>{PROBE_KINDS[k].label}</option>)}
        </select>
      </Field>
      <Field id={`${p}-price`} label={`Self-pay price (${currency})`} hint="Applies to bookings from now on." error={errors.selfPayPriceCents?.message}>
        <input id={`${p}-price`} inputMode="decimal" className="field-input" autoComplete="off" placeholder="0.00" {...register('selfPayPriceCents')} {...invalid(`${p}-price`, errors.selfPayPriceCents)} />
      </Field>
      <Field id={`${p}-deposit`} label={`Deposit (${currency})`} hint="Taken when a self-pay exam is booked; at most the price." error={errors.depositCents?.message}>
        <input id={`${p}-deposit`} inputMode="decimal" className="field-input" autoComplete="off" placeholder="0.00" {...register('depositCents')} {...invalid(`${p}-deposit`, errors.depositCents)} />
      </Field>
      <div className="sm:col-span-2">
        <Field id={`${p}-preparation`} label="Preparation instructions" hint="Sent to the patient with the booking confirmation." error={errors.preparationText?.message}>
          <textarea id={`${p}-preparation`} rows={3} className="field-input" {...register('preparationText')} {...invalid(`${p}-preparation`, errors.preparationText)} />
        </Field>
      </div>
      <FormButtons saving={saving} editing={!!row} onCancel={onCancel} />
    </form>
  );
}
