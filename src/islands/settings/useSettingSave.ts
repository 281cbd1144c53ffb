import { useState } from 'react';
import { api, ApiError } from '../../lib/api-client';
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
