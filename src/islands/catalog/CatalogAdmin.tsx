import { QueryClientProvider } from '@tanstack/react-query';
import { useEffect, useRef, useState, type KeyboardEvent } from 'react';
import { queryClient } from '../../lib/query-client';
import { ExamTypesPanel } from './ExamTypesPanel';
import type { TemplateChoice } from './ExamTypeForm';
import { ProbesPanel } from './ProbesPanel';
import { RoomsPanel } from './RoomsPanel';
import { ScannersPanel } from './ScannersPanel';

interface Props {
  templates: TemplateChoice[];
  /** The clinic's currency code, for the price fields. */
  currency: string;
  /** The clinic's today (YYYY-MM-DD), for probes' service dates. */
  today: string;
}

const TABS = [
  { id: 'exam-types', label: 'Exam types' },
  { id: 'rooms', label: 'Rooms' },
  { id: 'scanners', label: 'Scanners' },
  { id: 'probes', label: 'Probes' },
] as const;
type TabId = (typeof TABS)[number]['id'];

const fromHash = (): TabId => TABS.find((t) => `#${t.id}` === globalThis.location?.hash)?.id ?? 'exam-types';

function Catalog({ templates, currency, today }: Props) {
  const [tab, setTab] = useState<TabId>('exam-types');
  const buttons = useRef<Record<string, HTMLButtonElement | null>>({});
  // The hash keeps the tab across a reload; read after hydration so the server's first render matches.
  useEffect(() => setTab(fromHash()), []);
  const choose = (id: TabId, focus = false) => {
    setTab(id);
    history.replaceState(null, '', `#${id}`);
    if (focus) buttons.current[id]?.focus();
  };
  const onKey = (e: KeyboardEvent) => {
    const i = TABS.findIndex((t) => t.id === tab);
    const step = e.key === 'ArrowRight' ? 1 : e.key === 'ArrowLeft' ? -1 : 0;
    if (step) choose(TABS[(i + step + TABS.length) % TABS.length]!.id, true);
  };

  return (
    <div className="space-y-5">
      <div role="tablist" aria-label="Catalog" className="flex gap-1 border-b border-ink-100" onKeyDown={onKey}>
        {TABS.map((t) => (
          <button
            key={t.id}
            ref={(el) => { buttons.current[t.id] = el; }}
            type="button"
            role="tab"
            id={`tab-${t.id}`}
            aria-selected={tab === t.id}
            aria-controls={`panel-${t.id}`}
            tabIndex={tab === t.id ? 0 : -1}
            className={`-mb-px border-b-2 px-4 py-2 text-sm font-semibold ${tab === t.id ? 'border-crest-600 text-crest-800' : 'border-transparent text-ink-500 hover:text-ink-800'}`}
            onClick={() => choose(t.id)}
          >
            {t.label}
          </button>
        ))}
      </div>
      <div role="tabpanel" id={`panel-${tab}`} aria-labelledby={`tab-${tab}`}>
        {tab === 'exam-types' && <ExamTypesPanel templates={templates} currency={currency} />}
        {tab === 'rooms' && <RoomsPanel />}
        {tab === 'scanners' && <ScannersPanel />}
        {tab === 'probes' && <ProbesPanel today={today} />}
      </div>
    </div>
  );
}

/** The clinic's catalog for the manager: exam types, rooms, scanners and probes. */
export default function CatalogAdmin(props: Props) {
  return (
    <QueryClientProvider client={queryClient}>
      <Catalog {...props} />
    </QueryClientProvider>
  );
}
