import { zodResolver } from '@hookform/resolvers/zod';
import { createColumnHelper } from '@tanstack/react-table';
import { useMemo } from 'react';
import { useForm } from 'react-hook-form';
import { roomFieldsSchema, type RoomFields, type RoomRow } from '../../lib/schemas/catalog-admin';
import { CatalogPanel } from './CatalogPanel';
import { Field, FormButtons, FormHead, invalid } from './Field';
import { useSaveRow } from './useSaveRow';

const col = createColumnHelper<RoomRow>();

function RoomForm({ row, onDone, onCancel }: { row?: RoomRow; onDone: (message: string) => void; onCancel: () => void }) {
  const p = row ? `room-${row.id}` : 'room-new';
  const title = row ? `Edit ${row.name}` : 'New room';
  const { register, handleSubmit, setError, formState: { errors } } = useForm<RoomFields>({
    resolver: zodResolver(roomFieldsSchema),
    defaultValues: { name: row?.name ?? '' },
  });
  const { submit, saving } = useSaveRow('rooms', row, setError);
  return (
    <form className="card grid gap-4 p-5 sm:grid-cols-2" noValidate aria-label={title}
      onSubmit={handleSubmit((v) => submit(v, (saved) => onDone(row ? `Changes to ${saved.name} saved.` : `${saved.name} added. Add its scanner under Scanners.`)))}>
      <FormHead title={title} problem={errors.root?.message} />
      <Field id={`${p}-name`} label="Name" hint="As the schedule and the booking form show it." error={errors.name?.message}>
        <input id={`${p}-name`} className="field-input" autoComplete="off" {...register('name')} {...invalid(`${p}-name`, errors.name)} />
      </Field>
      <FormButtons saving={saving} editing={!!row} onCancel={onCancel} />
    </form>
  );
}

/** Rooms: where exams take place; one is taken out of use once its scanners are. */
export function RoomsPanel() {
  const columns = useMemo(
    () => [
      col.accessor('name', { header: 'Name', cell: (c) => <span className="font-medium">{c.getValue()}</span> }),
      col.accessor('scanners', { header: 'Scanners in use', enableSorting: false, cell: (c) => (c.getValue().length ? c.getValue().join(', ') : '—') }),
    ],
    [],
  );
  return (
    <CatalogPanel
      list="rooms"
      noun="room"
      columns={columns}
      initialSort="name"
      rowName={(r) => r.name}
      status={(r) => ({ inUse: r.active, label: r.active ? 'In use' : 'Deactivated' })}
      toggle={(r) => (r.active ? { label: 'Deactivate', active: false, danger: true } : { label: 'Reactivate', active: true })}
      toggled={(r, { row }) => (row.active ? `${r.name} is in use again.` : `${r.name} is deactivated: it is no longer offered for booking.`)}
      form={({ row, onDone, onCancel }) => <RoomForm key={row?.id ?? 'new'} row={row} onDone={onDone} onCancel={onCancel} />}
    />
  );
}
