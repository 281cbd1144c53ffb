import type { FieldValues, Path, UseFormSetError } from 'react-hook-form';
import { ApiError } from '../../lib/api-client';

/**
 * Shows a refused request on a react-hook-form form: each field error on its field, the
 * server's message at the top when it named no field, `fallback` when the request never got an
 * answer (e.g. the network).
 */
export function showApiError<T extends FieldValues>(error: unknown, setError: UseFormSetError<T>, fallback: string): void {
  if (error instanceof ApiError) {
    for (const [field, message] of Object.entries(error.fields)) setError(field as Path<T>, { message });
    if (Object.keys(error.fields).length === 0) setError('root', { message: error.message });
  } else setError('root', { message: fallback });
}
