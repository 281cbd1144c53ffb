import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { api, ApiError } from '../../lib/api-client';
import { ROLES, ROLE_LABELS } from '../../lib/roles';
import { createUserSchema, type UserRow } from '../../lib/schemas/users';
import type { ReferrerChoice } from './types';
import { Field } from './Field';

type FormIn = z.input<typeof createUserSchema>;
type FormOut = z.output<typeof createUserSchema>;

export function NewUserForm({ referrers, onCreated }: { referrers: ReferrerChoice[]; onCreated: (u: UserRow) => void }) {
  const client = useQueryClient();
  const {
    register,
    handleSubmit,
    watch,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<FormIn, unknown, FormOut>({
    resolver: zodResolver(createUserSchema),
    defaultValues: { email: '', displayName: '', role: 'frontdesk', password: '', referrerId: null },
  });
  const create = useMutation({
    mutationFn: (body: FormOut) => api<{ user: UserRow }>('/api/users', { method: 'POST', body }),
    onSuccess: ({ user }) => {
      void client.invalidateQueries({ queryKey: ['users'] });
      onCreated(user);
    },
    onError: (error) => {
      if (error instanceof ApiError) {
        for (const [field, message] of Object.entries(error.fields)) setError(field as keyof FormIn, { message });
        setError('root', { message: error.message });
      } else setError('root', { message: 'The account could not be saved.' });
    },
  });
  const role = watch('role');

  return (
    <form className="card grid gap-4 p-5 sm:grid-cols-2" noValidate onSubmit={handleSubmit((v) => create.mutateAsync(v).catch(() => undefined))} aria-label="New account">
      <h2 className="text-base font-semibold sm:col-span-2">New account</h2>
      {errors.root && <p role="alert" className="rounded-md bg-high-50 px-3 py-2 text-sm text-high-800 sm:col-span-2">{errors.root.message}</p>}
      <Field id="new-name" label="Full name" error={errors.displayName?.message}>
        <input id="new-name" className="field-input" autoComplete="off" {...register('displayName')} aria-invalid={!!errors.displayName} />
      </Field>
      <Field id="new-email" label="E-mail" error={errors.email?.message}>
        <input id="new-email" type="email" className="field-input" autoComplete="off" {...register('email')} aria-invalid={!!errors.email} />
      </Field>
      <Field id="new-role" label="Role" error={errors.role?.message}>
        <select id="new-role" className="field-input" {...register('role')}>
          {ROLES.map((r) => <option key={r} value={r}>{ROLE_LABELS[r]}</option>)}
        </select>
      </Field>
      {role === 'referrer' && (
        <Field id="new-referrer" label="Directory entry" error={errors.referrerId?.message}>
          <select id="new-referrer" className="field-input" {...register('referrerId')} aria-invalid={!!errors.referrerId}>
            <option value="">Choose the referring clinician…</option>
            {referrers.map((r) => <option key={r.id} value={r.id}>{r.name} — {r.practice}</option>)}
          </select>
        </Field>
      )}
      <Field id="new-password" label="First password" hint="At least 12 characters. Ask them to change it under My account." error={errors.password?.message}>
        <input id="new-password" type="password" className="field-input" autoComplete="new-password" {...register('password')} aria-invalid={!!errors.password} />
      </Field>
      <div className="sm:col-span-2">
        <button type="submit" className="btn-primary" disabled={isSubmitting}>{isSubmitting ? 'Saving…' : 'Create account'}</button>
      </div>
    </form>
  );
}
