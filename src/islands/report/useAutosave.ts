import { useEffect, useRef, useState } from 'react';
import { api } from '../../lib/api-client';
import { createAutosaver, type Autosaver, type SaveFailure, type SaveStatus } from '../../lib/report-form/autosave';
import type { DraftSavedDto, ReportDto } from '../../lib/schemas/reports';

/** What one save sends: the body, and which nodule draft each sent nodule came from. */
export interface DraftSnapshot {
  body: { measurements: Record<string, number | string>; nodules: unknown[]; heightCm: number | null; weightKg: number | null; probeId: number | null };
  noduleKeys: string[];
}

const INITIAL: SaveStatus<ReportDto> = { phase: 'idle', savedAt: null, reason: null, fields: {}, current: null, sent: null };

/**
 * The autosaver of one report, wired to the page: saves on a pause in typing, when the page
 * is hidden or loses focus, and warns before leaving with unsaved entries.
 */
export function useAutosave(reportId: number, version: number, snapshot: () => DraftSnapshot): { status: SaveStatus<ReportDto>; saver: Autosaver<ReportDto> } {
  const [status, setStatus] = useState(INITIAL);
  const snapshotRef = useRef(snapshot);
  snapshotRef.current = snapshot;
  const saverRef = useRef<Autosaver<ReportDto> | null>(null);
  saverRef.current ??= createAutosaver<DraftSnapshot, { report: DraftSavedDto }, ReportDto>({
    version,
    snapshot: () => snapshotRef.current(),
    send: (snap, v) => api<{ report: DraftSavedDto }>(`/api/reports/${reportId}/draft`, { method: 'PUT', body: { version: v, ...snap.body } }),
    versionOf: (r) => r.report.version,
    currentOf: (f: SaveFailure) => (f.details?.current as ReportDto | undefined) ?? null,
    onStatus: setStatus,
  });
  const saver = saverRef.current;

  useEffect(() => {
    const flush = () => void saver.flush();
    const onHide = () => document.visibilityState === 'hidden' && flush();
    const onLeave = (e: BeforeUnloadEvent) => {
      if (saver.dirty || saver.status.phase === 'saving') {
        e.preventDefault();
        e.returnValue = '';
      }
    };
    document.addEventListener('visibilitychange', onHide);
    window.addEventListener('blur', flush);
    window.addEventListener('pagehide', flush);
    window.addEventListener('beforeunload', onLeave);
    return () => {
      document.removeEventListener('visibilitychange', onHide);
      window.removeEventListener('blur', flush);
      window.removeEventListener('pagehide', flush);
      window.removeEventListener('beforeunload', onLeave);
      saver.dispose();
    };
  }, [saver]);

  return { status, saver };
}
