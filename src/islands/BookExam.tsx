import { zodResolver } from '@hookform/resolvers/zod';
import { QueryClientProvider, useQueryClient } from '@tanstack/react-query';
import { useEffect, useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { api, ApiError } from '../lib/api-client';
import { formatMoney } from '../lib/booking/refunds';
import { queryClient } from '../lib/query-client';
import { bookExamSchema } from '../lib/schemas/exams';
import type { PatientSummary } from '../lib/schemas/patients';
import type { ReferrerRow } from '../lib/schemas/referrers';
import { formatInstant, zonedDate } from '../lib/time';
import { PatientPicker } from './booking/PatientPicker';
import { ReferrerPicker } from './booking/ReferrerPicker';
import { SlotPicker } from './booking/SlotPicker';
import { TakePayment } from './payments/TakePayment';
import { Field } from './users/Field';

interface Catalog {
  examTypes: Array<{ id: number; name: string; durationMinutes: number; selfPayPriceCents: number; depositCents: number; currency: string }>;
  rooms: Array<{ id: number; name: string }>;
  scanners: Array<{ id: number; name: string; roomId: number }>;
  sonographers: Array<{ id: number; name: string }>;
}

interface Props {
  catalog: Catalog;
  timeZone: string;
  patient: PatientSummary | null;
  initialRoomId?: number;
  initialStart?: string;
  paymentsMode: 'test' | 'live' | 'off';
  publishableKey?: string;
}

type FormIn = z.input<typeof bookExamSchema>;
type FormOut = z.output<typeof bookExamSchema>;
type Booked = { id: number; accessionNumber: string; paymentState: string };

function BookingForm({ catalog, timeZone, patient: initialPatient, initialRoomId, initialStart, paymentsMode, publishableKey }: Props) {
  const client = useQueryClient();
  const [patient, setPatient] = useState<PatientSummary | null>(initialPatient);
  const [referrer, setReferrer] = useState<ReferrerRow | null>(null);
  const [booked, setBooked] = useState<Booked | null>(null);
  const [paid, setPaid] = useState<string | null>(null);
  const firstRoom = initialRoomId ?? catalog.rooms[0]?.id;
  const { register, handleSubmit, watch, setValue, setError, formState: { errors, isSubmitting } } = useForm<FormIn, unknown, FormOut>({
    resolver: zodResolver(bookExamSchema),
    defaultValues: {
      patientId: initialPatient?.id ?? ('' as unknown as number),
      examTypeId: catalog.examTypes[0]?.id,
      referrerId: null,
      indication: '',
      priority: 'routine',
      payer: 'self-pay',
      roomId: firstRoom,
      scannerId: catalog.scanners.find((s) => s.roomId === firstRoom)?.id,
      sonographerId: catalog.sonographers[0]?.id,
      start: initialStart ?? '',
    },
  });
  const [examTypeId, roomId, scannerId, sonographerId, start, payer] = watch(['examTypeId', 'roomId', 'scannerId', 'sonographerId', 'start', 'payer']);
  const type = catalog.examTypes.find((t) => t.id === Number(examTypeId));
  const roomScanners = catalog.scanners.filter((s) => s.roomId === Number(roomId));

  // A room has its own scanner: follow the room unless the chosen scanner is already in it.
  useEffect(() => {
    if (!roomScanners.some((s) => s.id === Number(scannerId))) setValue('scannerId', roomScanners[0]?.id ?? ('' as unknown as number));
  }, [roomId]); // eslint-disable-line react-hooks/exhaustive-deps

  const onSubmit = handleSubmit(async (values) => {
    try {
      const { exam } = await api<{ exam: Booked }>('/api/exams', { method: 'POST', body: values });
      setBooked(exam);
      void client.invalidateQueries({ queryKey: ['slots'] });
      void client.invalidateQueries({ queryKey: ['worklist'] });
    } catch (e) {
      if (e instanceof ApiError) {
        for (const [f, message] of Object.entries(e.fields)) setError(f as keyof FormIn, { message });
        setError('root', { message: e.message });
        if (e.status === 409) void client.invalidateQueries({ queryKey: ['slots'] });
      } else setError('root', { message: 'The exam could not be booked.' });
    }
  });

  if (booked) {
    const depositDue = booked.paymentState === 'deposit-due' && type && type.depositCents > 0;
    return (
      <section className="card space-y-4 p-6" aria-label="Booked">
        <h2 className="text-lg font-semibold">Booked: {type?.name} for {patient ? `${patient.givenName} ${patient.familyName}` : 'the patient'}</h2>
        <p className="text-sm text-ink-600">{start ? formatInstant(new Date(start), timeZone) : ''} · accession number <b>{booked.accessionNumber}</b>. The preparation instructions are on their way to the patient by e-mail.</p>
        {depositDue && !paid && (
          <div className="rounded-md border border-dune-300 bg-dune-50 p-4">
            <h3 className="mb-2 font-semibold">Deposit: {formatMoney(type!.depositCents, type!.currency)}</h3>
            <TakePayment examId={booked.id} kind="deposit" amountCents={type!.depositCents} currency={type!.currency} mode={paymentsMode} publishableKey={publishableKey} onDone={(a) => setPaid(a.message)} />
          </div>
        )}
        {paid && <p role="status" className="rounded-md bg-crest-50 px-3 py-2 text-sm text-crest-800">{paid}</p>}
        <div className="flex gap-3">
          <a className="btn-primary" href={`/exams/${booked.id}`}>Open the exam</a>
          <a className="btn-quiet" href={`/worklist?day=${start ? zonedDate(new Date(start), timeZone) : ''}`}>Worklist for that day</a>
          <a className="btn-quiet" href="/exams/new">Book another</a>
        </div>
      </section>
    );
  }

  return (
    <form className="grid gap-6 lg:grid-cols-2" noValidate onSubmit={onSubmit} aria-label="Book an exam">
      <div className="card space-y-4 p-5">
        {errors.root && <p role="alert" className="rounded-md bg-high-50 px-3 py-2 text-sm text-high-800">{errors.root.message}</p>}
        <PatientPicker value={patient} error={errors.patientId?.message} onChange={(p) => { setPatient(p); setValue('patientId', p?.id ?? ('' as unknown as number), { shouldValidate: !!p }); }} />
        <Field id="examTypeId" label="Exam" error={errors.examTypeId?.message}>
          <select id="examTypeId" className="field-input" {...register('examTypeId')}>
            {catalog.examTypes.map((t) => <option key={t.id} value={t.id}>{t.name} ({t.durationMinutes} min)</option>)}
          </select>
        </Field>
        <ReferrerPicker value={referrer} onChange={(r) => { setReferrer(r); setValue('referrerId', r?.id ?? null); }} />
        <Field id="indication" label="Indication" hint="Why the exam was asked for, as on the referral." error={errors.indication?.message}>
          <textarea id="indication" rows={2} className="field-input" {...register('indication')} aria-invalid={!!errors.indication} />
        </Field>
        <div className="flex flex-wrap gap-6">
          <fieldset>
            <legend className="field-label">Priority</legend>
            <label className="mr-4 text-sm"><input type="radio" value="routine" {...register('priority')} /> Routine</label>
            <label className="text-sm"><input type="radio" value="urgent" {...register('priority')} /> Urgent</label>
          </fieldset>
          <fieldset>
            <legend className="field-label">Who pays</legend>
            <label className="mr-4 text-sm"><input type="radio" value="self-pay" {...register('payer')} /> Self-pay</label>
            <label className="text-sm"><input type="radio" value="insured" {...register('payer')} /> Insurer</label>
          </fieldset>
        </div>
        {type && payer === 'self-pay' && <p className="text-sm text-ink-600">Self-pay price {formatMoney(type.selfPayPriceCents, type.currency)}; deposit {formatMoney(type.depositCents, type.currency)} at booking, the rest at check-out.</p>}
      </div>

      <div className="card space-y-4 p-5">
        <div className="grid gap-3 sm:grid-cols-3">
          <Field id="roomId" label="Room" error={errors.roomId?.message}>
            <select id="roomId" className="field-input" {...register('roomId')}>{catalog.rooms.map((r) => <option key={r.id} value={r.id}>{r.name}</option>)}</select>
          </Field>
          <Field id="scannerId" label="Scanner" error={errors.scannerId?.message}>
            <select id="scannerId" className="field-input" {...register('scannerId')}>{roomScanners.map((s) => <option key={s.id} value={s.id}>{s.name}</option>)}</select>
          </Field>
          <Field id="sonographerId" label="Sonographer" error={errors.sonographerId?.message}>
            <select id="sonographerId" className="field-input" {...register('sonographerId')}>{catalog.sonographers.map((s) => <option key={s.id} value={s.id}>{s.name}</option>)}</select>
          </Field>
        </div>
        <SlotPicker examTypeId={Number(examTypeId)} roomId={Number(roomId)} scannerId={Number(scannerId)} sonographerId={Number(sonographerId)}
          from={initialStart ? zonedDate(new Date(initialStart), timeZone) : undefined} selected={start || null} onPick={(iso) => setValue('start', iso, { shouldValidate: true })} />
        <div>
          <p className="field-label">Start</p>
          <p className="mt-1 text-sm" aria-live="polite">{start ? <b>{formatInstant(new Date(start), timeZone)}</b> : <span className="text-ink-500">Pick a free time above.</span>}</p>
          {errors.start && <p className="field-error" role="alert">{errors.start.message}</p>}
        </div>
        <button type="submit" className="btn-primary w-full" disabled={isSubmitting}>{isSubmitting ? 'Booking…' : 'Book exam'}</button>
      </div>
    </form>
  );
}

export default function BookExam(props: Props) {
  return (
    <QueryClientProvider client={queryClient}>
      <BookingForm {...props} />
    </QueryClientProvider>
  );
}
