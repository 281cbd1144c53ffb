import { zodResolver } from '@hookform/resolvers/zod';
import { useQuery } from '@tanstack/react-query';
import { useForm } from 'react-hook-form';
import { PROBE_KINDS } from '../../lib/clinical/probes';
import { PROBE_KIND_CODES } from '../../lib/exam-status';
import { probeFieldsSchema, type ProbeFields, type ProbeFormValues, type ProbeRow } from '../../lib/schemas/catalog-admin';
import { Field, FormButtons, FormHead, invalid } from './Field';
import { catalogQuery } from './queries';
import { useSaveRow } from './useSaveRow';

interface Props {
  row?: ProbeRow;
  /** The clinic's today, for a new probe's first day in service. */
  today: string;
  onDone: (message: string) => void;
  onCancel: () => void;
}

/** Adds or edits a probe: kind, the clinic's own model label, serial number, band, service dates. */
export function ProbeForm({ row, today, onDone, onCancel }: Props) {
  const p = row ? `probe-${row.id}` : 'probe-new';
  const title = row ? `Edit ${row.modelLabel} (${row.serialNumber})` : 'New probe';
  const scanners = useQuery(catalogQuery('scanners')).data ?? [];
  const { register, handleSubmit, setError, formState: { errors } } = useForm<ProbeFormValues, unknown, ProbeFields>({
    resolver: zodResolver(probeFieldsSchema),
    defaultValues: {
      kind: row?.kind ?? 'linear',
      modelLabel: row?.modelLabel ?? '',
      serialNumber: row?.serialNumber ?? '',
      minFrequencyMhz: row ? String(row.minFrequencyMhz) : '',
      maxFrequencyMhz: row ? String(row.maxFrequencyMhz) : '',
      endocavitary: row?.endocavitary ?? false,
      scannerId: row?.scannerId ?? '',
      inServiceFrom: row?.inServiceFrom ?? today,
      inServiceTo: row?.inServiceTo ?? '',
    },
  });
  const { submit, saving } = useSaveRow('probes', row, setError);
  const choices = scanners.filter((s) => s.active || s.id === row?.scannerId);
  const mhz = { type: 'number', inputMode: 'decimal', min: 0.5, max: 50, step: 0.1, className: 'field-input' } as const;

  return (
    <form className="card grid gap-4 p-5 sm:grid-cols-2" noValidate aria-label={title}
      onSubmit={handleSubmit((v) => submit(v, (saved) => onDone(row ? `Changes to ${saved.modelLabel} (${saved.serialNumber}) saved.` : `${saved.modelLabel} (${saved.serialNumber}) added.`)))}>
      <FormHead title={title} problem={errors.root?.message} />
      <Field id={`${p}-kind`} label="Kind" error={errors.kind?.message}>
        <select id={`${p}-kind`} className="field-input" {...register('kind')} {...invalid(`${p}-kind`, errors.kind)}>
          {PROBE_KIND_CODES.map((k) => <option key={k} value={k}>{PROBE_KINDS[k].label}</option>)}
        </select>
      </Field>
      <Field id={`${p}-label`} label="Model label" hint="The clinic's own name for it, e.g. Linear 4–15." error={errors.modelLabel?.message}>
        <input id={`${p}-label`} className="field-input" autoComplete="off" {...register('modelLabel')} {...invalid(`${p}-label`, errors.modelLabel)} />
      </Field>
      <Field id={`${p}-serial`} label="Serial number" error={errors.serialNumber?.message}>
        <input id={`${p}-serial`} className="field-input font-mono" autoComplete="off" spellCheck={false} {...register('serialNumber')} {...invalid(`${p}-serial`, errors.serialNumber)} />
      </Field>
      <Field id={`${p}-scanner`} label="Scanner" hint="Leave empty while it is on the shelf." error={errors.scannerId?.message}>
        <select id={`${p}-scanner`} className="field-input" {...register('scannerId')} {...invalid(`${p}-scanner`, errors.scannerId)}>
          <option value="">None</option>
          {choices.map((s) => <option key={s.id} value={s.id}>{s.name}{s.active ? '' : ' (deactivated)'}</option>)}
        </select>
      </Field>
      <Field id={`${p}-min`} label="Lowest frequency (MHz)" error={errors.minFrequencyMhz?.message}>
        <input id={`${p}-min`} {...mhz} {...register('minFrequencyMhz')} {...invalid(`${p}-min`, errors.minFrequencyMhz)} />
      </Field>
      <Field id={`${p}-max`} label="Highest frequency (MHz)" error={errors.maxFrequencyMhz?.message}>
        <input id={`${p}-max`} {...mhz} {...register('maxFrequencyMhz')} {...invalid(`${p}-max`, errors.maxFrequencyMhz)} />
      </Field>
      <Field id={`${p}-from`} label="In service from" error={errors.inServiceFrom?.message}>
        <input id={`${p}-from`} type="date" className="field-input" {...register('inServiceFrom')} {...invalid(`${p}-from`, errors.inServiceFrom)} />
      </Field>
      <Field id={`${p}-to`} label="In service until (optional)" hint="Its last day in service." error={errors.inServiceTo?.message}>
        <input id={`${p}-to`} type="date" className="field-input" {...register('inServiceTo')} {...invalid(`${p}-to`, errors.inServiceTo)} />
      </Field>
      <label className="flex items-center gap-2 text-sm text-ink-700 sm:col-span-2">
        <input type="checkbox" className="size-4 rounded border-ink-300 text-crest-600" {...register('endocavitary')} />
        Endocavitary probe
      </label>
      <FormButtons saving={saving} editing={!!row} onCancel={onCancel} />
    </form>
  );
}
