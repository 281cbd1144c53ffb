import { zodResolver } from '@hookform/resolvers/zod';
import { useQuery } from '@tanstack/react-query';
import { useForm } from 'react-hook-form';
import { scannerFieldsSchema, type ScannerFields, type ScannerFormValues, type ScannerRow } from '../../lib/schemas/catalog-admin';
import { Field, FormButtons, FormHead, invalid } from './Field';
import { catalogQuery } from './queries';
import { useSaveRow } from './useSaveRow';

interface Props {
  row?: ScannerRow;
  onDone: (message: string) => void;
  onCancel: () => void;
}

/** Adds or edits a scanner: its room, its name and the AE title it calls Crestline with. */
export function ScannerForm({ row, onDone, onCancel }: Props) {
  const p = row ? `scanner-${row.id}` : 'scanner-new';
  const title = row ? `Edit ${row.name}` : 'New scanner';
  const rooms = useQuery(catalogQuery('rooms')).data ?? [];
  const { register, handleSubmit, setError, formState: { errors } } = useForm<ScannerFormValues, unknown, ScannerFields>({
    resolver: zodResolver(scannerFieldsSchema),
    defaultValues: { roomId: row?.roomId ?? '', name: row?.name ?? '', aeTitle: row?.aeTitle ?? '' },
  });
  const { submit, saving } = useSaveRow('scanners', row, setError);
  const choices = rooms.filter((r) => r.active || r.id === row?.roomId);

  return (
    <form className="card grid gap-4 p-5 sm:grid-cols-2" noValidate aria-label={title}
      onSubmit={handleSubmit((v) => submit(v, (saved) => onDone(row ? `Changes to ${saved.name} saved.` : `${saved.name} added; it can call in as ${saved.aeTitle} within a few seconds.`)))}>
      <FormHead title={title} problem={errors.root?.message} />
      <Field id={`${p}-name`} label="Name" error={errors.name?.message}>
        <input id={`${p}-name`} className="field-input" autoComplete="off" {...register('name')} {...invalid(`${p}-name`, errors.name)} />
      </Field>
      <Field id={`${p}-room`} label="Room" hint={row && row.upcomingExams > 0 ? 'Fixed while exams are booked on this scanner.' : undefined} error={errors.roomId?.message}>
        <select id={`${p}-room`} className="field-input" {...register('roomId')} {...invalid(`${p}-room`, errors.roomId)}>
          <option value="">Choose…</option>
          {choices.map((r) => <option key={r.id} value={r.id}>{r.name}{r.active ? '' : ' (deactivated)'}</option>)}
        </select>
      </Field>
      <Field id={`${p}-ae`} label="DICOM AE title" hint="Up to 16 characters, as set on the scanner; unique in the clinic." error={errors.aeTitle?.message}>
        <input id={`${p}-ae`} className="field-input font-mono" autoComplete="off" spellCheck={false} maxLength={16} {...register('aeTitle')} {...invalid(`${p}-ae`, errors.aeTitle)} />
      </Field>
      <FormButtons saving={saving} editing={!!row} onCancel={onCancel} />
    </form>
  );
}
