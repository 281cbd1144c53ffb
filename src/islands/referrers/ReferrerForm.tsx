import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { useForm } from 'react-hook-form';
import { api, ApiError } from '../../lib/api-client';
import { referrerFieldsSchema, type ReferrerFields, type ReferrerFormValues, type ReferrerRow } from '../../lib/schemas/referrers';
import { Field } from '../users/Field';

interface Props {
  /** The entry being edited; leave out to add a new one. */
  referrer?: ReferrerRow;
  onDone: (message: string) => void;
  onCancel: () => void;
}

type Change = Partial<ReferrerFields> & { active?: boolean };

/**
 * Adds a referring clinician or edits one, including (de)activation. An edit carries the
 * version it was opened with; a concurrent change is refused (409) and the form keeps its values.
 */
export function ReferrerForm({ referrer, onDone, onCancel }: Props) {
  const client = useQueryClient();
  const prefix = referrer ? 'edit-referrer' : 'new-referrer';
  const title = referrer ? `Edit ${referrer.name}` : 'New referring clinician';
  const {
    register,
    handleSubmit,
    setError,
    clearErrors,
    formState: { errors },
  } = useForm<ReferrerFormValues, unknown, ReferrerFields>({
    resolver: zodResolver(referrerFieldsSchema),
    defaultValues: { name: referrer?.name ?? '', practice: referrer?.practice ?? '', email: referrer?.email ?? '', phone: referrer?.phone ?? '' },
  });

  const save = useMutation({
    mutationFn: (body: Change) =>
      referrer
        ? api<{ referrer: ReferrerRow }>(`/api/referrers/${referrer.id}`, { method: 'PATCH', body: { ...body, version: referrer.version } })
        : api<{ referrer: ReferrerRow }>('/api/referrers', { method: 'POST', body }),
    // Also after a refusal: a stale edit means the list shows an old version.
    onSettled: () => void client.invalidateQueries({ queryKey: ['referrers'] }),
  });

  const run = async (body: Change, message: (r: ReferrerRow) => string) => {
    clearErrors('root');
    try {
      const { referrer: saved } = await save.mutateAsync(body);
      onDone(message(saved));
    } catch (error) {
      if (error instanceof ApiError) {
        Object.entries(error.fields).forEach(([field, msg], i) => setError(field as keyof ReferrerFormValues, { message: msg }, { shouldFocus: i === 0 }));
        setError('root', {
          message: error.code === 'STALE' ? `${error.message} Your changes are still in the form; close it and open the entry again to see theirs.` : error.message,
        });
      } else setError('root', { message: 'The entry could not be saved. Nothing was changed.' });
    }
  };

  const a11y = (id: string, invalid: boolean) => ({ 'aria-invalid': invalid, 'aria-describedby': invalid ? `${id}-error` : undefined });

  return (
    <form
      className="card grid gap-4 p-5 sm:grid-cols-2"
      noValidate
      aria-label={title}
      onSubmit={handleSubmit((v) => run(v, (r) => (referrer ? `Changes to ${r.name} saved.` : `${r.name} added to the directory.`)))}
    >
      <div className="flex items-start justify-between gap-3 sm:col-span-2">
        <h2 className="text-base font-semibold">{title}</h2>
        {referrer && !referrer.active && <span className="rounded-full bg-ink-100 px-2 py-0.5 text-xs font-semibold text-ink-500">Deactivated</span>}
      </div>
      {errors.root && <p role="alert" className="rounded-md bg-high-50 px-3 py-2 text-sm text-high-800 sm:col-span-2">{errors.root.message}</p>}
      <Field id={`${prefix}-name`} label="Name" hint="As it should appear on reports, e.g. Dr Ada Ward." error={errors.name?.message}>
        <input id={`${prefix}-name`} className="field-input" autoComplete="off" {...register('name')} {...a11y(`${prefix}-name`, !!errors.name)} />
      </Field>
      <Field id={`${prefix}-practice`} label="Practice" error={errors.practice?.message}>
        <input id={`${prefix}-practice`} className="field-input" autoComplete="off" {...register('practice')} {...a11y(`${prefix}-practice`, !!errors.practice)} />
      </Field>
      <Field id={`${prefix}-email`} label="E-mail" hint="Reports are sent here; each entry has its own." error={errors.email?.message}>
        <input id={`${prefix}-email`} type="email" className="field-input" autoComplete="off" {...register('email')} {...a11y(`${prefix}-email`, !!errors.email)} />
      </Field>
      <Field id={`${prefix}-phone`} label="Phone (optional)" error={errors.phone?.message}>
        <input id={`${prefix}-phone`} type="tel" className="field-input" autoComplete="off" {...register('phone')} {...a11y(`${prefix}-phone`, !!errors.phone)} />
      </Field>
      <div className="flex flex-wrap gap-2 sm:col-span-2">
        <button type="submit" className="btn-primary" disabled={save.isPending}>
          {save.isPending ? 'Saving…' : referrer ? 'Save changes' : 'Add to directory'}
        </button>
        <button type="button" className="btn-quiet" onClick={onCancel}>
          Cancel
        </button>
        {referrer && (
          <span className="ml-auto">
            {referrer.active ? (
              <button
                type="button"
                className="btn-danger"
                disabled={save.isPending}
                onClick={() => void run({ active: false }, (r) => `${r.name} is deactivated and no longer offered when booking.`)}
              >
                Deactivate
              </button>
            ) : (
              <button type="button" className="btn-quiet" disabled={save.isPending} onClick={() => void run({ active: true }, (r) => `${r.name} is active again.`)}>
                Reactivate
              </button>
            )}
          </span>
        )}
      </div>
    </form>
  );
}
