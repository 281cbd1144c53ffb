import type { ImagingMode } from '../../lib/clinical';

const MODE_TONE: Record<ImagingMode, string> = {
  'B-mode': 'bg-ink-50 text-ink-600 ring-ink-200',
  'M-mode': 'bg-dune-50 text-dune-700 ring-dune-300',
  Doppler: 'bg-crest-50 text-crest-700 ring-crest-200',
};

/** The imaging mode a value is measured in, as a small tag. */
export function ModeBadge({ mode, id }: { mode: ImagingMode; id?: string }) {
  return (
    <span id={id} className={`shrink-0 rounded px-1.5 py-px text-[0.6875rem] font-medium ring-1 ring-inset ${MODE_TONE[mode]}`}>
      {mode}
    </span>
  );
}
