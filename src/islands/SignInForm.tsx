import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { signInWithPassword } from '../lib/auth-client';
import { SIGN_IN_MESSAGES, signInSchema, type SignInInput } from '../lib/schemas/auth';

interface Props {
  next: string;
  initialCode?: string | null;
}

export default function SignInForm({ next, initialCode }: Props) {
  const [refusal, setRefusal] = useState<string | null>(initialCode ? (SIGN_IN_MESSAGES[initialCode] ?? SIGN_IN_MESSAGES.invalid!) : null);
  const {
    register,
    handleSubmit,
    formState: { errors, isSubmitting },
  } = useForm<SignInInput>({ resolver: zodResolver(signInSchema), defaultValues: { email: '', password: '' } });

  const onSubmit = handleSubmit(async (values) => {
    setRefusal(null);
    const result = await signInWithPassword(values.email, values.password);
    if (result.ok) {
      window.location.assign(next);
      return;
    }
    setRefusal(SIGN_IN_MESSAGES[result.code] ?? SIGN_IN_MESSAGES.invalid!);
  });

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-5" aria-describedby={refusal ? 'signin-refusal' : undefined}>
      {refusal && (
        <div id="signin-refusal" role="alert" className="rounded-md border border-high-200 bg-high-50 px-3 py-2 text-sm text-high-800">
          {refusal}
        </div>
      )}
      <div>
        <label htmlFor="email" className="field-label">E-mail</label>
        <input
          id="email"
          type="email"
          autoComplete="username"
          className="field-input"
          aria-invalid={errors.email ? 'true' : 'false'}
          aria-describedby={errors.email ? 'email-error' : undefined}
          {...register('email')}
        />
        {errors.email && <p id="email-error" className="field-error" role="alert">{errors.email.message}</p>}
      </div>
      <div>
        <label htmlFor="password" className="field-label">Password</label>
        <input
          id="password"
          type="password"
          autoComplete="current-password"
          className="field-input"
          aria-invalid={errors.password ? 'true' : 'false'}
          aria-describedby={errors.password ? 'password-error' : undefined}
          {...register('password')}
        />
        {errors.password && <p id="password-error" className="field-error" role="alert">{errors.password.message}</p>}
      </div>
      <button type="submit" className="btn-primary w-full" disabled={isSubmitting}>
        {isSubmitting ? 'Signing in…' : 'Sign in'}
      </button>
    </form>
  );
}
