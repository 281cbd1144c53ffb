import type { ReactNode } from 'react';
import { Field } from '../users/Field';

export { Field };

/** The ARIA attributes of a control with an error shown by Field. */
export const invalid = (id: string, error: unknown) => ({ 'aria-invalid': !!error, 'aria-describedby': error ? `${id}-error` : undefined });

/** The top of a catalog form: its heading and a refusal that named no field (stale edit, clash, rule). */
export function FormHead({ title, problem, children }: { title: string; problem?: string; children?: ReactNode }) {
  return (
    <>
      <div className="flex items-start justify-between gap-3 sm:col-span-2">
        <h2 className="text-base font-semibold">{title}</h2>
        {children}
      </div>
      {problem && <p role="alert" className="rounded-md bg-high-50 px-3 py-2 text-sm text-high-800 sm:col-span-2">{problem}</p>}
    </>
  );
}

/** Save and cancel, at the foot of a catalog form. */
export function FormButtons({ saving, editing, onCancel }: { saving: boolean; editing: boolean; onCancel: () => void }) {
  return (
    <div className="flex flex-wrap gap-2 sm:col-span-2">
      <button type="submit" className="btn-primary" disabled={saving}>{saving ? 'Saving…' : editing ? 'Save changes' : 'Add'}</button>
      <button type="button" className="btn-quiet" onClick={onCancel}>Cancel</button>
    </div>
  );
}
