import { DIASTOLIC_CONCLUSION_LABELS, LV_GEOMETRY_LABELS, type EvaluationSuccess } from '../../lib/clinical';
import { sentence } from '../../lib/report-form/display';

const RAP_TEXT = { normal: 'normal', intermediate: 'intermediate', high: 'high' } as const;
const NOTE_LABEL: Record<string, string> = { lvGeometry: 'LV geometry', diastolic: 'Diastolic function', aorticRoot: 'Aortic root z-score', la: 'LA volume', bsa: 'BSA' };
const URGENCY = { 1: 'within minutes', 2: 'within hours', 3: 'within days' } as const;

/** The engine's structured conclusions (geometry, diastolic function, RA pressure, aorta) and why any is missing. */
export function Assessments({ result }: { result: EvaluationSuccess }) {
  const a = result.assessments;
  const items: Array<{ key: string; label: string; text: string; detail?: string }> = [];
  if (a.lvGeometry) items.push({ key: 'lv', label: 'LV geometry', text: LV_GEOMETRY_LABELS[a.lvGeometry] });
  if (a.diastolic) {
    items.push({ key: 'dd', label: 'Diastolic function', text: DIASTOLIC_CONCLUSION_LABELS[a.diastolic.conclusion], detail: `${a.diastolic.reason} (${a.diastolic.algorithm})` });
  }
  if (a.rap) items.push({ key: 'rap', label: 'RA pressure estimate', text: `${a.rap.rapMmHg} mmHg, ${RAP_TEXT[a.rap.category]} (range ${a.rap.rangeMmHg[0]}–${a.rap.rangeMmHg[1]} mmHg)` });
  if (a.aaa) {
    const s = a.aaa.surveillance;
    items.push({
      key: 'aaa',
      label: 'Abdominal aorta',
      text: `${a.aaa.isAneurysm ? 'Aneurysmal' : 'Not aneurysmal'}; ${s.advice.text}${a.aaa.atRepairThreshold ? '; at the repair threshold' : ''}`,
      detail: [s.schemeName, ...s.notes].join('; '),
    });
  }
  const notes = Object.entries(a.notes ?? {});
  if (items.length === 0 && notes.length === 0 && result.urgentPrompts.length === 0) return null;
  return (
    <section aria-labelledby="assessments-heading" className="card p-4">
      <h2 id="assessments-heading" className="text-sm font-semibold text-ink-700">Assessments</h2>
      {result.urgentPrompts.length > 0 && (
        <ul className="mt-2 space-y-1.5" aria-label="Urgent prompts">
          {result.urgentPrompts.map((p) => (
            <li key={p.ruleId} className="rounded-md bg-high-50 px-3 py-2 text-sm text-high-800 ring-1 ring-high-200">
              <b>Consider urgent communication ({URGENCY[p.category]}):</b> {p.message}
            </li>
          ))}
        </ul>
      )}
      <dl className="mt-2 space-y-2 text-sm">
        {items.map((i) => (
          <div key={i.key} data-testid={`assessment-${i.key}`}>
            <dt className="text-xs text-ink-500">{i.label}</dt>
            <dd className="font-medium text-ink-900">{sentence(i.text)}</dd>
            {i.detail && <dd className="text-xs text-ink-500">{i.detail}</dd>}
          </div>
        ))}
      </dl>
      {notes.length > 0 && (
        <ul className="mt-2 space-y-0.5 text-xs text-ink-500">
          {notes.map(([k, note]) => <li key={k}>{NOTE_LABEL[k] ?? k}: {note}</li>)}
        </ul>
      )}
    </section>
  );
}
