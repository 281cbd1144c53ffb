import { memo } from 'react';
import { BSA_METHOD_LABELS, formatQuantity, HEIGHT_BOUNDS_CM, PROBE_KINDS, WEIGHT_BOUNDS_KG, type DerivedValue, type EvaluationSuccess, type Flag, type ProbeKind } from '../../lib/clinical';
import { sentence } from '../../lib/report-form/display';
import { HEIGHT_KEY, PROBE_KEY, WEIGHT_KEY } from '../../lib/report-form/entries';
import type { FormContext } from '../../lib/report-form/types';
import type { FieldActions } from './actions';
import { DerivedList } from './DerivedList';
import { fieldDomId } from './fieldIds';

interface Props {
  patient: FormContext['patient'];
  probes: FormContext['probes'];
  defaultProbe: ProbeKind;
  heightCm: string;
  weightKg: string;
  probeId: number | null;
  errors: Readonly<Record<string, string>>;
  bsa: EvaluationSuccess['patient']['bsa'];
  derived: readonly DerivedValue[];
  flags: ReadonlyMap<string, Flag>;
  actions: FieldActions;
}

const SEX_TEXT = { female: 'Female', male: 'Male', other: 'Other', unknown: 'Not recorded' } as const;

function BodyInput({ id, label, unit, value, error, hint, onChange }: { id: string; label: string; unit: string; value: string; error?: string; hint: string; onChange: (v: string) => void }) {
  const dom = fieldDomId(id);
  return (
    <div>
      <label htmlFor={dom} className="field-label">{label}</label>
      <div className="relative mt-1">
        <input
          id={dom}
          type="text"
          inputMode="decimal"
          autoComplete="off"
          data-entry=""
          aria-label={`${label}, ${unit}`}
          className="field-input mt-0 pr-10 tabular-nums"
          value={value}
          aria-invalid={error ? true : undefined}
          aria-describedby={`${dom}-hint${error ? ` ${dom}-error` : ''}`}
          onChange={(e) => onChange(e.target.value)}
        />
        <span aria-hidden="true" className="pointer-events-none absolute inset-y-0 right-3 flex items-center text-xs text-ink-500">{unit}</span>
      </div>
      <p id={`${dom}-hint`} className="mt-1 text-xs text-ink-500">{hint}</p>
      {error && <p id={`${dom}-error`} className="field-error text-xs" role="alert">{sentence(error)}</p>}
    </div>
  );
}

/** Sex and age from the exam (not editable here), height and weight for BSA, and the probe used. */
export const PatientFactors = memo(function PatientFactors(p: Props) {
  const probeDom = fieldDomId(PROBE_KEY);
  const showBsaLine = p.bsa !== null && !p.derived.some((d) => d.code === 'bsaM2');
  return (
    <section aria-labelledby="section-patient" className="card p-4 sm:p-5">
      <h2 id="section-patient" className="text-base font-semibold text-ink-900">Patient and technique</h2>
      <div className="mt-3 grid gap-x-5 gap-y-4 sm:grid-cols-2 2xl:grid-cols-4">
        <dl className="grid grid-cols-2 gap-3 text-sm sm:col-span-2 2xl:col-span-1 2xl:grid-cols-1">
          <div><dt className="field-label">Sex</dt><dd className="mt-1 text-ink-900">{SEX_TEXT[p.patient.sex]}</dd></div>
          <div><dt className="field-label">Age at exam</dt><dd className="mt-1 text-ink-900">{p.patient.ageYears} years</dd></div>
        </dl>
        <BodyInput id={HEIGHT_KEY} label="Height" unit="cm" value={p.heightCm} error={p.errors[HEIGHT_KEY]} hint={`For BSA; ${HEIGHT_BOUNDS_CM[0]}–${HEIGHT_BOUNDS_CM[1]} cm`} onChange={(v) => p.actions.patient('heightCm', v)} />
        <BodyInput id={WEIGHT_KEY} label="Weight" unit="kg" value={p.weightKg} error={p.errors[WEIGHT_KEY]} hint={`For BSA; ${WEIGHT_BOUNDS_KG[0]}–${WEIGHT_BOUNDS_KG[1]} kg`} onChange={(v) => p.actions.patient('weightKg', v)} />
        <div>
          <label htmlFor={probeDom} className="field-label">Probe used</label>
          <select
            id={probeDom}
            className="field-input"
            value={p.probeId ?? ''}
            aria-invalid={p.errors[PROBE_KEY] ? true : undefined}
            onChange={(e) => p.actions.probe(e.target.value === '' ? null : Number(e.target.value))}
          >
            <option value="">Not recorded</option>
            {p.probes.map((probe) => (
              <option key={probe.id} value={probe.id}>
                {PROBE_KINDS[probe.kind].label}: {probe.label} ({probe.frequencyMhz})
              </option>
            ))}
          </select>
          <p className="mt-1 text-xs text-ink-500">Usual for this exam: {PROBE_KINDS[p.defaultProbe].label.toLowerCase()}</p>
          {p.errors[PROBE_KEY] && <p className="field-error text-xs" role="alert">{sentence(p.errors[PROBE_KEY])}</p>}
        </div>
      </div>
      {showBsaLine && p.bsa && (
        <p className="mt-3 text-sm text-ink-700" data-testid="bsa">
          BSA <b className="tabular-nums">{formatQuantity(p.bsa.valueM2, 'm2', 2)}</b> <span className="text-xs text-ink-500">({BSA_METHOD_LABELS[p.bsa.method]})</span>
        </p>
      )}
      <DerivedList derived={p.derived} flags={p.flags} />
    </section>
  );
});
