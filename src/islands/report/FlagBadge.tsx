import { memo, useId, useState } from 'react';
import type { Flag } from '../../lib/clinical';
import { flagDetailLines, flagStatusText, flagTone, type FlagTone } from '../../lib/report-form/display';

const TONE: Record<FlagTone, string> = {
  normal: 'bg-crest-50 text-crest-800 ring-crest-200',
  high: 'bg-high-50 text-high-800 ring-high-200',
  low: 'bg-low-50 text-low-800 ring-low-200',
  muted: 'bg-ink-50 text-ink-600 ring-ink-200',
};

// Arrows carry the direction for readers who cannot tell the colours apart; the word says it too.
const MARK: Record<FlagTone, string> = { normal: '✓', high: '▲', low: '▼', muted: '–' };

/**
 * A flag's verdict as a small focusable badge; its range, source and reference-set version
 * show on hover and on keyboard focus, and are the badge's accessible description.
 */
export const FlagBadge = memo(function FlagBadge({ flag }: { flag: Flag }) {
  const tipId = useId();
  const [pinned, setPinned] = useState(false);
  const tone = flagTone(flag);
  return (
    <span className="group relative inline-flex">
      <button
        type="button"
        data-testid={`flag-${flag.valueCode}`}
        data-status={flag.status}
        aria-describedby={tipId}
        aria-expanded={pinned}
        onClick={() => setPinned((p) => !p)}
        onKeyDown={(e) => e.key === 'Escape' && setPinned(false)}
        onBlur={() => setPinned(false)}
        className={`inline-flex items-center gap-1 rounded-full px-2 py-0.5 text-xs font-semibold ring-1 ring-inset ${TONE[tone]}`}
      >
        <span aria-hidden="true">{MARK[tone]}</span>
        {flagStatusText(flag)}
      </button>
      <span
        role="tooltip"
        id={tipId}
        className={`absolute top-full left-0 z-30 mt-1 w-72 rounded-md bg-ink-900 px-3 py-2 text-xs leading-relaxed font-normal text-white shadow-lg group-hover:visible group-focus-within:visible ${pinned ? 'visible' : 'invisible'}`}
      >
        {flagDetailLines(flag).map((line) => (
          <span key={line} className="block">{line}</span>
        ))}
        <span className="mt-1 block text-ink-300">Decision support only.</span>
      </span>
    </span>
  );
}, (a, b) => a.flag.status === b.flag.status && a.flag.grade === b.flag.grade && a.flag.range?.text === b.flag.range?.text && a.flag.referenceId === b.flag.referenceId && a.flag.adjustment === b.flag.adjustment && a.flag.message === b.flag.message);
