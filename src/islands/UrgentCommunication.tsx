import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { api } from '../lib/api-client';
import { showApiError } from './forms/api-errors';
import { COMMUNICATION_METHODS, communicationSchema, type CommunicationInput } from '../lib/schemas/reports';
import { zonedClock, zonedDate } from '../lib/time';
import { Field } from './users/Field';

export interface UrgentCommunicationProps {
  reportId: number;
  /** The engine's prompts for this report: a suggestion to the physician, who decides. */
  prompts: Array<{ ruleId: string; category: 1 | 2 | 3; message: string }>;
  /** Who referred, offered as the person told. */
  referrer: string | null;
  timeZone: string;
}

const METHOD_TEXT = { telephone: 'Telephone', 'in-person': 'In person', 'video-call': 'Video call', 'secure-message': 'Secure message (acknowledged)' } as const;
const WITHIN = { 1: 'within minutes', 2: 'within hours', 3: 'within days' } as const;

/**
 * The record of an urgent finding told directly to a clinician: what, to whom, how, when and
 * whether it was read back. Recorded once; the report then carries the statement (page and PDF).
 */
export default function UrgentCommunication(p: UrgentCommunicationProps) {
  const [open, setOpen] = useState(false);
  const now = () => { const d = new Date(); return `${zonedDate(d, p.timeZone)}T${zonedClock(d, p.timeZone)}`; };
  const {
    register,
    handleSubmit,
    setError,
    setValue,
    formState: { errors, isSubmitting },
  } = useForm<CommunicationInput>({
    resolver: zodResolver(communicationSchema) as never,
    defaultValues: { ruleId: null, finding: '', recipientName: p.referrer ?? '', recipientRole: p.referrer ? 'referring physician' : '', method: 'telephone', communicatedAt: now(), readBack: false },
  });

  const start = (prompt?: UrgentCommunicationProps['prompts'][number]) => {
    setValue('ruleId', prompt?.ruleId ?? null);
    setValue('finding', prompt ? prompt.message : '');
    setValue('communicatedAt', now());
    setOpen(true);
  };

  const onSubmit = handleSubmit(async (values) => {
    try {
      await api(`/api/reports/${p.reportId}/communications`, { method: 'POST', body: values });
      window.location.reload();
    } catch (error) {
      showApiError(error, setError, 'The communication could not be recorded.');
    }
  });

  return (
    <section className="card space-y-4 p-5" aria-labelledby="urgent-communication-heading">
      <div>
        <h2 id="urgent-communication-heading" className="text-base font-semibold text-ink-900">Urgent communication</h2>
        <p className="mt-1 text-sm text-ink-600">Record a finding you told a clinician directly. The report will carry the statement; the record cannot be changed afterwards.</p>
      </div>
      {p.prompts.length > 0 && !open && (
        <ul className="space-y-2">
          {p.prompts.map((x) => (
            <li key={x.ruleId} className="flex flex-wrap items-center justify-between gap-2 rounded-md bg-high-50 px-3 py-2 text-sm text-high-800 ring-1 ring-high-200">
              <span><b>Suggested ({WITHIN[x.category]}):</b> {x.message}</span>
              <button type="button" className="btn-quiet" onClick={() => start(x)}>Record a call about this</button>
            </li>
          ))}
        </ul>
      )}
      {!open && <button type="button" className="btn-quiet" onClick={() => start()}>Record an urgent communication…</button>}
      {open && (
        <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label="Record an urgent communication">
          {errors.root && <p role="alert" className="rounded-md bg-high-50 px-3 py-2 text-sm text-high-800">{errors.root.message}</p>}
          <Field id="uc-finding" label="Finding communicated" error={errors.finding?.message}>
            <textarea id="uc-finding" rows={2} className="field-input" {...register('finding')} aria-invalid={!!errors.finding} />
          </Field>
          <div className="grid gap-4 sm:grid-cols-2">
            <Field id="uc-recipient" label="Told to" error={errors.recipientName?.message}>
              <input id="uc-recipient" className="field-input" autoComplete="off" {...register('recipientName')} aria-invalid={!!errors.recipientName} />
            </Field>
            <Field id="uc-role" label="Their role (optional)" hint="e.g. referring physician, on-call surgeon" error={errors.recipientRole?.message}>
              <input id="uc-role" className="field-input" autoComplete="off" {...register('recipientRole')} />
            </Field>
          </div>
          <fieldset>
            <legend className="field-label">How</legend>
            <div className="mt-1 flex flex-wrap gap-x-4 gap-y-1">
              {COMMUNICATION_METHODS.map((m) => (
                <label key={m} className="text-sm"><input type="radio" value={m} className="mr-1" {...register('method')} />{METHOD_TEXT[m]}</label>
              ))}
            </div>
            {errors.method && <p className="field-error" role="alert">{errors.method.message}</p>}
          </fieldset>
          <Field id="uc-when" label="When (clinic time)" error={errors.communicatedAt?.message}>
            <input id="uc-when" type="datetime-local" className="field-input max-w-xs" {...register('communicatedAt')} aria-invalid={!!errors.communicatedAt} />
          </Field>
          <label className="flex items-start gap-2 text-sm">
            <input type="checkbox" className="mt-0.5" {...register('readBack')} />
            <span>They read the finding back to me, and I confirmed it.</span>
          </label>
          <div className="flex gap-2">
            <button type="submit" className="btn-primary" disabled={isSubmitting}>{isSubmitting ? 'Recording…' : 'Record communication'}</button>
            <button type="button" className="btn-quiet" disabled={isSubmitting} onClick={() => setOpen(false)}>Cancel</button>
          </div>
        </form>
      )}
    </section>
  );
}
