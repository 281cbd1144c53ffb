import { useState } from 'react';
import { api, ApiError } from '../../lib/api-client';
import type { Autosaver } from '../../lib/report-form/autosave';
import type { ReportDto } from '../../lib/schemas/reports';
import { fieldDomId } from './fieldIds';

export type SubmitState = { phase: 'idle' | 'busy' | 'done' } | { phase: 'failed'; message: string };

/** Focus and show a field named by an error key. */
export function reveal(key: string): void {
  const el = document.getElementById(fieldDomId(key));
  if (!el) return;
  el.scrollIntoView({ block: 'center', behavior: 'smooth' });
  el.focus({ preventScroll: true });
}

interface Options {
  reportId: number;
  saver: Autosaver<ReportDto>;
  /** Error keys of the fields in scan order, to go to the first one the server names. */
  scanOrder: readonly string[];
  /** The server's 422 named these required fields. */
  onMissing: (keys: string[]) => void;
}

/**
 * "Submit preliminary": nothing held back by a typing error or an unfinished nodule, every
 * entry saved first, then the submit with the version that save returned.
 */
export function useSubmit({ reportId, saver, scanOrder, onMissing }: Options) {
  const [state, setState] = useState<SubmitState>({ phase: 'idle' });
  const fail = (message: string) => setState({ phase: 'failed', message });

  const submit = async (held: { firstError: string | undefined; unfinishedNodule: string | undefined }) => {
    if (held.firstError !== undefined) {
      fail('Correct the values marked in red first; a value with an error is not saved.');
      reveal(held.firstError);
      return;
    }
    if (held.unfinishedNodule !== undefined) {
      fail(`Nodule ${held.unfinishedNodule} is incomplete: finish or remove it first.`);
      return;
    }
    setState({ phase: 'busy' });
    if (!(await saver.flush())) {
      fail('The latest entries are not saved, so the report was not submitted. See the save status above.');
      return;
    }
    try {
      await api<{ report: ReportDto }>(`/api/reports/${reportId}/submit`, { method: 'POST', body: { version: saver.version } });
      saver.close('the report has been submitted.');
      setState({ phase: 'done' });
    } catch (e) {
      const err = e instanceof ApiError ? e : new ApiError(0, 'UNKNOWN', 'The report could not be submitted.');
      if (err.status === 409 && err.code === 'STALE') saver.conflict((err.details.current as ReportDto | undefined) ?? null);
      const keys = Object.keys(err.fields);
      if (err.status === 422 && keys.length > 0) {
        onMissing(keys);
        const first = scanOrder.find((k) => keys.includes(k)) ?? keys[0]!;
        // After the re-render that marks the fields.
        requestAnimationFrame(() => reveal(first));
        fail(`Not submitted: ${keys.length} required value${keys.length === 1 ? ' is' : 's are'} still missing, marked in the form. Enter them or mark them not measurable.`);
        return;
      }
      fail(err.message);
    }
  };
  return { state, submit };
}
