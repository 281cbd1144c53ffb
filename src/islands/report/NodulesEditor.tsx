import { useState } from 'react';
import type { NoduleAssessment, NoduleSpec } from '../../lib/clinical';
import type { NoduleDraft } from '../../lib/report-form/form-state';
import type { FieldActions } from './actions';
import { NoduleCard } from './NoduleCard';

interface Props {
  spec: NoduleSpec;
  nodules: readonly NoduleDraft[];
  /** The engine's assessments, by nodule id. */
  assessments: ReadonlyMap<string, NoduleAssessment>;
  errors: Readonly<Record<string, string>>;
  actions: FieldActions;
}

/** The nodule list: add, reorder, remove (with undo), and which ones the engine reports and biopsies. */
export function NodulesEditor({ spec, nodules, assessments, errors, actions }: Props) {
  const [removed, setRemoved] = useState<{ nodule: NoduleDraft; index: number } | null>(null);
  const scored = nodules.map((n) => assessments.get(n.id)).filter((a): a is NoduleAssessment => a !== undefined);
  const reported = scored.filter((a) => a.reported).map((a) => a.id);
  const biopsy = scored.filter((a) => a.biopsySelected).map((a) => a.id);
  const full = nodules.length >= spec.maxEntered;
  const remove = (key: string) => {
    const index = nodules.findIndex((n) => n.key === key);
    if (index >= 0) setRemoved({ nodule: nodules[index]!, index });
    actions.removeNodule(key);
  };
  return (
    <section aria-labelledby="section-nodules" className="card p-4 sm:p-5">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h2 id="section-nodules" className="text-base font-semibold text-ink-900">Thyroid nodules</h2>
        <p className="text-xs text-ink-500">
          Up to {spec.maxEntered} entered; ACR TI-RADS reports at most {spec.maxReported} and selects at most {spec.maxBiopsied} for FNA.
        </p>
      </div>
      {scored.length > 0 && (
        <p className="mt-2 text-sm text-ink-700" data-testid="nodule-selection">
          Reported: <b>{reported.join(', ') || 'none'}</b>
          <span className="mx-2 text-ink-300">|</span>
          Selected for FNA: <b>{biopsy.join(', ') || 'none'}</b>
        </p>
      )}
      {nodules.length === 0 && <p className="mt-2 text-sm text-ink-600">No nodules entered.</p>}
      <ol className="mt-3 space-y-3">
        {nodules.map((n, i) => (
          <NoduleCard key={n.key} nodule={n} index={i} count={nodules.length} assessment={assessments.get(n.id)} errors={errors} actions={actions} onRemove={remove} />
        ))}
      </ol>
      <div className="mt-3 flex flex-wrap items-center gap-3">
        <button type="button" className="btn-quiet" disabled={full} onClick={() => { setRemoved(null); actions.addNodule(); }}>
          Add nodule
        </button>
        {full && <span className="text-xs text-ink-500">The limit of {spec.maxEntered} nodules is reached.</span>}
        {removed && (
          <span role="status" className="text-sm text-ink-700">
            Nodule {removed.nodule.id} removed.{' '}
            <button type="button" className="font-semibold text-crest-700 underline-offset-2 hover:underline" onClick={() => { actions.restoreNodule(removed.index, removed.nodule); setRemoved(null); }}>
              Undo
            </button>
          </span>
        )}
      </div>
    </section>
  );
}
