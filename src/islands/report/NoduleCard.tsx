import { memo } from 'react';
import { COMPOSITION, ECHOGENIC_FOCI, ECHOGENICITY, formatNumber, MARGIN, SHAPE, type NoduleAssessment } from '../../lib/clinical';
import { noduleGaps, noduleKey } from '../../lib/report-form/entries';
import type { NoduleDraft, NoduleTextField } from '../../lib/report-form/form-state';
import { noduleActionText, sentence, tiradsLevelText } from '../../lib/report-form/display';
import type { FieldActions } from './actions';
import { fieldDomId } from './fieldIds';

interface Props {
  nodule: NoduleDraft;
  index: number;
  count: number;
  assessment: NoduleAssessment | undefined;
  errors: Readonly<Record<string, string>>;
  actions: FieldActions;
  onRemove: (key: string) => void;
}

const LOBES = [['right', 'Right lobe'], ['left', 'Left lobe'], ['isthmus', 'Isthmus']] as const;
const ZONES = [['upper', 'Upper'], ['mid', 'Mid'], ['lower', 'Lower']] as const;
const GAP_LABELS: Record<string, string> = { lobe: 'location', lengthMm: 'length', widthMm: 'width', depthMm: 'depth', composition: 'composition', echogenicity: 'echogenicity', shape: 'shape', margin: 'margin' };

const pts = (n: number) => `${n} ${n === 1 ? 'pt' : 'pts'}`;
/** ACR feature options with their points, e.g. ["solid", "Solid or almost completely solid · 2 pts"]. */
const options = (table: Readonly<Record<string, { points: number; label: string }>>) => Object.entries(table).map(([value, o]) => [value, `${sentence(o.label)} · ${pts(o.points)}`] as const);
const FEATURE_GROUPS: ReadonlyArray<readonly [NoduleTextField, string, ReturnType<typeof options>]> = [
  ['composition', 'Composition', options(COMPOSITION)],
  ['echogenicity', 'Echogenicity', options(ECHOGENICITY)],
  ['shape', 'Shape', options(SHAPE)],
  ['margin', 'Margin', options(MARGIN)],
];
const DIMS = [['lengthMm', 'Length (craniocaudal)'], ['widthMm', 'Width (transverse)'], ['depthMm', 'Depth (AP)']] as const;

function Select({ nodule, index, field, label, choices, blank, errors, actions }: { nodule: NoduleDraft; index: number; field: NoduleTextField; label: string; choices: ReadonlyArray<readonly [string, string]>; blank: string; errors: Props['errors']; actions: FieldActions }) {
  const id = fieldDomId(`${nodule.key}.${field}`);
  const error = errors[noduleKey(index, field)];
  return (
    <div className="min-w-0">
      <label htmlFor={id} className="field-label">{label}</label>
      <select id={id} data-entry="" className="field-input" value={nodule[field]} aria-invalid={error ? true : undefined} onChange={(e) => actions.noduleField(nodule.key, field, e.target.value)}>
        <option value="">{blank}</option>
        {choices.map(([value, text]) => <option key={value} value={value}>{text}</option>)}
      </select>
      {error && <p className="field-error text-xs" role="alert">{sentence(error)}</p>}
    </div>
  );
}

function Result({ a }: { a: NoduleAssessment }) {
  return (
    <div className="mt-3 flex flex-wrap items-center gap-x-3 gap-y-1 rounded-md bg-ink-50 px-3 py-2 text-sm" data-testid="nodule-result">
      <span><b className="tabular-nums">{pts(a.points)}</b></span>
      <span className="font-semibold text-ink-900">{tiradsLevelText(a)}</span>
      <span className="text-ink-600">largest {formatNumber(a.maxDiameterMm, 1)} mm</span>
      <span className={a.action === 'fna' ? 'font-semibold text-high-800' : 'text-ink-800'}>{noduleActionText(a)}</span>
      <span className="flex gap-1.5">
        {a.reported ? <span className="rounded bg-crest-100 px-1.5 text-xs font-medium text-crest-800">Reported</span> : <span className="rounded bg-white px-1.5 text-xs text-ink-500 ring-1 ring-ink-200">Not described individually</span>}
        {a.biopsySelected && <span className="rounded bg-high-50 px-1.5 text-xs font-semibold text-high-800 ring-1 ring-high-200">Selected for FNA</span>}
      </span>
    </div>
  );
}

/** One nodule: location, three diameters, the five ACR feature groups, and the engine's verdict. */
export const NoduleCard = memo(function NoduleCard({ nodule, index, count, assessment, errors, actions, onRemove }: Props) {
  const legendId = `nodule-${nodule.key}`;
  const gaps = noduleGaps(nodule);
  const shared = { nodule, index, errors, actions };
  return (
    <li>
      <fieldset aria-labelledby={legendId} className="rounded-lg p-4 ring-1 ring-ink-200">
        <div className="flex flex-wrap items-center justify-between gap-2">
          <h3 id={legendId} className="font-semibold text-ink-900">Nodule {nodule.id}</h3>
          <div className="flex gap-1.5">
            <button type="button" id={`move-${nodule.key}--1`} className="btn-quiet px-2 py-1 text-xs" disabled={index === 0} onClick={() => actions.moveNodule(nodule.key, -1)}>
              Move up<span className="sr-only"> nodule {nodule.id}</span>
            </button>
            <button type="button" id={`move-${nodule.key}-1`} className="btn-quiet px-2 py-1 text-xs" disabled={index === count - 1} onClick={() => actions.moveNodule(nodule.key, 1)}>
              Move down<span className="sr-only"> nodule {nodule.id}</span>
            </button>
            <button type="button" className="btn-quiet px-2 py-1 text-xs text-high-800" onClick={() => onRemove(nodule.key)}>
              Remove<span className="sr-only"> nodule {nodule.id}</span>
            </button>
          </div>
        </div>
        <div className="mt-3 grid gap-x-4 gap-y-3 sm:grid-cols-2">
          <Select {...shared} field="lobe" label="Location" choices={LOBES} blank="Choose…" />
          <Select {...shared} field="zone" label="Zone" choices={ZONES} blank="Not stated" />
        </div>
        <div className="mt-3 grid gap-x-4 gap-y-3 sm:grid-cols-3">
          {DIMS.map(([field, label]) => {
            const id = fieldDomId(`${nodule.key}.${field}`);
            const error = errors[noduleKey(index, field)];
            return (
              <div key={field} className="min-w-0">
                <label htmlFor={id} className="field-label">{label}</label>
                <div className="relative mt-1">
                  <input
                    id={id}
                    type="text"
                    inputMode="decimal"
                    autoComplete="off"
                    data-entry=""
                    aria-label={`${label}, mm`}
                    className="field-input mt-0 pr-10 tabular-nums"
                    value={nodule[field]}
                    aria-invalid={error ? true : undefined}
                    aria-describedby={error ? `${id}-error` : undefined}
                    onChange={(e) => actions.noduleField(nodule.key, field, e.target.value)}
                  />
                  <span aria-hidden="true" className="pointer-events-none absolute inset-y-0 right-3 flex items-center text-xs text-ink-500">mm</span>
                </div>
                {error && <p id={`${id}-error`} className="field-error text-xs" role="alert">{sentence(error)}</p>}
              </div>
            );
          })}
        </div>
        <div className="mt-3 grid gap-x-4 gap-y-3 sm:grid-cols-2">
          {FEATURE_GROUPS.map(([field, label, choices]) => (
            <Select key={field} {...shared} field={field} label={label} choices={choices} blank="Choose…" />
          ))}
        </div>
        <fieldset className="mt-3">
          <legend className="field-label">Echogenic foci <span className="font-normal text-ink-500">(all that apply; none ticked = none)</span></legend>
          <div className="mt-1 flex flex-wrap gap-x-4 gap-y-1">
            {Object.entries(ECHOGENIC_FOCI).map(([value, o]) => (
              <label key={value} className="inline-flex items-center gap-1.5 text-sm">
                <input type="checkbox" data-entry="" className="accent-crest-600" checked={nodule.foci.includes(value)} onChange={(e) => actions.noduleFocus(nodule.key, value, e.target.checked)} />
                {sentence(o.label)} · {pts(o.points)}
              </label>
            ))}
          </div>
          {errors[noduleKey(index, 'foci')] && <p className="field-error text-xs" role="alert">{sentence(errors[noduleKey(index, 'foci')]!)}</p>}
        </fieldset>
        {nodule.composition === 'spongiform' && (
          <p className="mt-2 text-xs text-ink-600">Spongiform: scored 0 points in total; the other features are not added (ACR TI-RADS).</p>
        )}
        {assessment ? (
          <Result a={assessment} />
        ) : (
          <p className="mt-3 text-sm text-ink-600">
            {gaps.length > 0
              ? `Still needed to score this nodule: ${gaps.map((g) => GAP_LABELS[g]).join(', ')}. It is saved once complete.`
              : 'Correct the values marked above; the nodule is scored and saved once they are plausible.'}
          </p>
        )}
      </fieldset>
    </li>
  );
});
