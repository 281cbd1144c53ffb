import { useState, type SubmitEvent } from 'react';
import { fieldErrors } from '../../lib/field-errors';
import { PERIOD_PRESETS, PERIOD_PRESET_LABELS, presetPeriod, type PeriodPreset } from '../../lib/dashboard/period';
import { dashboardPeriodSchema, type DashboardPeriod } from '../../lib/schemas/dashboard';

interface Props {
  /** The clinic's today, YYYY-MM-DD. */
  today: string;
  preset: PeriodPreset;
  period: DashboardPeriod;
  onChange: (preset: PeriodPreset, period: DashboardPeriod) => void;
}

/** This week, the last 30 days, this month, or dates of one's own (at most 366 days). */
export function PeriodPicker({ today, preset, period, onChange }: Props) {
  const [draft, setDraft] = useState<DashboardPeriod>(period);
  const [errors, setErrors] = useState<Record<string, string>>({});

  const choose = (next: PeriodPreset) => {
    setErrors({});
    if (next === 'custom') onChange('custom', period);
    else {
      const p = presetPeriod(next, today);
      setDraft(p);
      onChange(next, p);
    }
  };

  const apply = (event: SubmitEvent<HTMLFormElement>) => {
    event.preventDefault();
    const parsed = dashboardPeriodSchema.safeParse(draft);
    if (!parsed.success) return setErrors(fieldErrors(parsed.error));
    setErrors({});
    onChange('custom', parsed.data);
  };

  return (
    <form className="card flex flex-wrap items-end gap-3 p-4" aria-label="Period" onSubmit={apply} noValidate>
      <div>
        <label htmlFor="dashboard-preset" className="field-label">Period</label>
        <select id="dashboard-preset" className="field-input" value={preset} onChange={(e) => choose(e.target.value as PeriodPreset)}>
          {PERIOD_PRESETS.map((p) => <option key={p} value={p}>{PERIOD_PRESET_LABELS[p]}</option>)}
        </select>
      </div>
      {preset === 'custom' && (
        <>
          <div>
            <label htmlFor="dashboard-from" className="field-label">From</label>
            <input id="dashboard-from" type="date" className="field-input" value={draft.from} aria-invalid={Boolean(errors.from)}
              aria-describedby={errors.from ? 'dashboard-from-error' : undefined} onChange={(e) => setDraft({ ...draft, from: e.target.value })} />
            {errors.from && <p id="dashboard-from-error" className="field-error">{errors.from}</p>}
          </div>
          <div>
            <label htmlFor="dashboard-to" className="field-label">To</label>
            <input id="dashboard-to" type="date" className="field-input" value={draft.to} aria-invalid={Boolean(errors.to)}
              aria-describedby={errors.to ? 'dashboard-to-error' : undefined} onChange={(e) => setDraft({ ...draft, to: e.target.value })} />
            {errors.to && <p id="dashboard-to-error" className="field-error">{errors.to}</p>}
          </div>
          <button type="submit" className="btn-primary">Show</button>
        </>
      )}
    </form>
  );
}
