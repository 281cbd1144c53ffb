import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { api } from '../lib/api-client';
import { showApiError } from './forms/api-errors';
import { changePasswordSchema, type ChangePasswordInput } from '../lib/schemas/users';
import { Field } from './users/Field';

export default function ChangePassword() {
  const [done, setDone] = useState(false);
  const {
    register,
    handleSubmit,
    setError,
    reset,
    formState: { errors, isSubmitting },
  } = useForm<ChangePasswordInput>({
    resolver: zodResolver(changePasswordSchema),
    defaultValues: { currentPassword: '', newPassword: '', confirmPassword: '' },
  });

  const onSubmit = handleSubmit(async (values) => {
    setDone(false);
    try {
      await api('/api/account/password', { method: 'POST', body: values });
      reset();
      setDone(true);
    } catch (error) {
      showApiError(error, setError, 'The password could not be changed.');
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="card max-w-md space-y-4 p-5" aria-label="Change password">
      <h2 className="text-base font-semibold">Change password</h2>
      {done && <p role="status" className="rounded-md bg-crest-50 px-3 py-2 text-sm text-crest-800">Your password has been changed.</p>}
      {errors.root && <p role="alert" className="rounded-md bg-high-50 px-3 py-2 text-sm text-high-800">{errors.root.message}</p>}
      <Field id="current-password" label="Current password" error={errors.currentPassword?.message}>
        <input id="current-password" type="password" autoComplete="current-password" className="field-input" {...register('currentPassword')} aria-invalid={!!errors.currentPassword} />
      </Field>
      <Field id="new-password" label="New password" hint="At least 12 characters." error={errors.newPassword?.message}>
        <input id="new-password" type="password" autoComplete="new-password" className="field-input" {...register('newPassword')} aria-invalid={!!errors.newPassword} />
      </Field>
      <Field id="confirm-password" label="New password again" error={errors.confirmPassword?.message}>
        <input id="confirm-password" type="password" autoComplete="new-password" className="field-input" {...register('confirmPassword')} aria-invalid={!!errors.confirmPassword} />
      </Field>
      <button type="submit" className="btn-primary" disabled={isSubmitting}>{isSubmitting ? 'Saving…' : 'Change password'}</button>
    </form>
  );
}
