import { useState } from 'react';
import { useForm, type DefaultValues, type FieldValues, type Resolver } from 'react-hook-form';
import { api, ApiError } from '../../lib/api-client';
import { showApiError } from '../forms/api-errors';
import type { ClinicSettingsDto, SettingsGroup, SettingState } from '../../lib/schemas/settings';

/** A save refused because someone else saved first; `current` is what they saved. */
export interface StaleSave<T> {
  message: string;
  current: SettingState<T> | null;
}

/**
 * The part of a settings section that is not the form: the last saved state (its version goes
 * with the next save), the PUT itself, the "saved" notice and a refused stale save.
 *
 * @example const s = useSettingSave('delivery', 'delivery', initial); await s.save(values, onError);
 */
export function useSettingSave<T>(path: string, group: SettingsGroup, initial: SettingState<T>) {
  const [saved, setSaved] = useState(initial);
  const [notice, setNotice] = useState<string | null>(null);
  const [stale, setStale] = useState<StaleSave<T> | null>(null);

  /** Sends the section; null when refused (a stale save is kept in `stale`, anything else goes to `onError`). */
  async function save<A extends { setting: SettingState<T> }>(body: unknown, onError: (error: unknown) => void): Promise<A | null> {
    setNotice(null);
    setStale(null);
    try {
      const answer = await api<A>(`/api/admin/settings/${path}`, { method: 'PUT', body });
      setSaved(answer.setting);
      return answer;
    } catch (error) {
      if (error instanceof ApiError && error.code === 'STALE') setStale({ message: error.message, current: (error.details.current as SettingState<T> | undefined) ?? null });
      else onError(error);
      return null;
    }
  }

  /** What is saved now: the other person's save from the refusal, or a fresh read. */
  async function latest(): Promise<SettingState<T>> {
    const fresh = stale?.current ?? ((await api<{ settings: ClinicSettingsDto }>('/api/admin/settings')).settings[group] as SettingState<T>);
    setSaved(fresh);
    setStale(null);
    return fresh;
  }

  return { saved, notice, setNotice, stale, save, latest };
}

/**
 * A whole settings section's form: react-hook-form over the section's schema, the save with its
 * version, field errors from the server, the reset to what was saved, and the props the
 * section's card needs (saved, notice, stale save, submit). `done` words the notice from the
 * server's answer (and may keep more of it, e.g. the exams still booked on a closed day).
 *
 * @example const { form, card } = useSettingForm({ path: 'delivery', group: 'delivery', initial, resolver: zodResolver(deliverySettingsSchema), toForm, failMessage, done: () => 'Saved.' });
 */
export function useSettingForm<T, F extends FieldValues, A extends { setting: SettingState<T> } = { setting: SettingState<T> }>(o: {
  path: string;
  group: SettingsGroup;
  initial: SettingState<T>;
  resolver: Resolver<F>;
  toForm: (saved: SettingState<T>) => F;
  failMessage: string;
  done: (answer: A) => string;
  /** Runs before each save (e.g. to clear a note of the last answer). */
  beforeSave?: () => void;
}) {
  const s = useSettingSave<T>(o.path, o.group, o.initial);
  const form = useForm<F>({ resolver: o.resolver, defaultValues: o.toForm(o.initial) as DefaultValues<F> });
  const onSubmit = form.handleSubmit(async (values) => {
    o.beforeSave?.();
    const answer = await s.save<A>(values, (e) => showApiError(e, form.setError, o.failMessage));
    if (!answer) return;
    form.reset(o.toForm(answer.setting));
    s.setNotice(o.done(answer));
  });
  const card = {
    saved: s.saved,
    notice: s.notice,
    stale: s.stale,
    submitting: form.formState.isSubmitting,
    dirty: form.formState.isDirty,
    rootError: form.formState.errors.root?.message,
    onSubmit,
    onLoadSaved: async () => form.reset(o.toForm(await s.latest())),
  };
  return { saved: s.saved, form, card };
}
