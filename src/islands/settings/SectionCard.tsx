import type { FormEventHandler, ReactNode } from 'react';
import { formatInstant } from '../../lib/time';
import type { SettingState } from '../../lib/schemas/settings';
import type { StaleSave } from './useSettingSave';

interface Props {
  id: string;
  title: string;
  /** What the section governs and what a change does (and does not do). */
  description: ReactNode;
  saved: SettingState<unknown>;
  timeZone: string;
  submitLabel: string;
  submitting: boolean;
  dirty: boolean;
  notice: ReactNode;
  stale: StaleSave<unknown> | null;
  rootError?: string;
  onSubmit: FormEventHandler<HTMLFormElement>;
  onLoadSaved: () => void;
  children: ReactNode;
}

/** One settings group as its own form: heading, explanation, fields, and a save of its own. */
export function SectionCard(p: Props) {
  return (
    <form className="card space-y-5 p-5" noValidate onSubmit={p.onSubmit} aria-labelledby={`${p.id}-heading`}>
      <div>
        <h2 id={`${p.id}-heading`} className="text-base font-semibold text-ink-900">{p.title}</h2>
        <div className="mt-1 space-y-1 text-sm text-ink-600">{p.description}</div>
      </div>
      {p.rootError && <p role="alert" className="rounded-md bg-high-50 px-3 py-2 text-sm text-high-800">{p.rootError}</p>}
      {p.stale && (
        <div role="alert" className="flex flex-wrap items-center justify-between gap-3 rounded-md bg-dune-50 px-3 py-2 text-sm text-dune-700 ring-1 ring-dune-300">
          <span>{p.stale.message}</span>
          <button type="button" className="btn-quiet py-1" onClick={p.onLoadSaved}>Load the saved version</button>
        </div>
      )}
      {p.children}
      <div className="flex flex-wrap items-center gap-3 border-t border-ink-100 pt-4">
        <button type="submit" className="btn-primary" disabled={p.submitting}>{p.submitting ? 'Saving…' : p.submitLabel}</button>
        {p.notice && <p role="status" className="text-sm text-crest-800">{p.notice}</p>}
        {!p.notice && p.dirty && <p className="text-sm text-dune-700">Unsaved changes.</p>}
        <p className="ml-auto text-xs text-ink-500">
          {p.saved.updatedAt ? `Last saved ${formatInstant(new Date(p.saved.updatedAt), p.timeZone)}` : 'Built-in defaults: never saved'}
        </p>
      </div>
    </form>
  );
}
