import type { SaveStatus } from '../../lib/report-form/autosave';
import type { ReportDto } from '../../lib/schemas/reports';

interface Props {
  status: SaveStatus<ReportDto>;
  /** When the report was last saved before this page opened (null for an untouched draft). */
  openedSavedAt: Date | null;
  /** Values with an error, kept in the form but left out of the save. */
  unsavedCount: number;
  clock: (d: Date) => string;
}

/** The one line saying whether the entries are safe: "Saved 10:42:13", "Saving…", "Not saved: …". */
export function saveStatusText({ status, openedSavedAt, unsavedCount, clock }: Props): { text: string; tone: 'ok' | 'busy' | 'bad' } {
  const held = unsavedCount > 0 ? ` · ${unsavedCount} value${unsavedCount === 1 ? '' : 's'} with an error not saved` : '';
  switch (status.phase) {
    case 'idle':
      return openedSavedAt ? { text: `Saved ${clock(openedSavedAt)}${held}`, tone: 'ok' } : { text: 'Nothing entered yet', tone: 'ok' };
    case 'pending':
      return { text: 'Changes not saved yet…', tone: 'busy' };
    case 'saving':
      return { text: 'Saving…', tone: 'busy' };
    case 'saved':
      return { text: `Saved ${status.savedAt ? clock(status.savedAt) : ''}${held}`, tone: 'ok' };
    case 'conflict':
      return { text: `Not saved: ${status.current?.updatedBy ?? 'someone else'} saved a newer version.`, tone: 'bad' };
    case 'error':
      return { text: `Not saved: ${status.reason ?? 'the save failed.'}${status.reason?.includes('session') ? '' : ' Trying again shortly.'}`, tone: 'bad' };
    default:
      return { text: `Not saved: ${status.reason ?? 'the save failed.'}`, tone: 'bad' };
  }
}

const TONE = { ok: 'text-crest-800', busy: 'text-ink-600', bad: 'font-semibold text-high-800' } as const;

export function SaveStatusLine(props: Props) {
  const { text, tone } = saveStatusText(props);
  return (
    <p data-testid="save-status" role="status" aria-live="polite" className={`text-sm ${TONE[tone]}`}>
      {text}
    </p>
  );
}
