import { zodResolver } from '@hookform/resolvers/zod';
import { useQueryClient } from '@tanstack/react-query';
import { useEffect, useState } from 'react';
import { useForm, type FieldError } from 'react-hook-form';
import { api, ApiError } from '../../lib/api-client';
import { SEXES } from '../../lib/exam-status';
import { patientDuplicatesQuery } from '../../lib/queries/patients';
import {
  EARLIEST_BIRTH_DATE,
  latestCalendarDate,
  patientFieldsSchema,
  SEX_LABELS,
  type PatientFields,
  type PatientFormValues,
  type PatientRecord,
  type PatientSummary,
} from '../../lib/schemas/patients';
import { Field } from '../users/Field';
import { DuplicateWarning } from './DuplicateWarning';

interface Props {
  /** The record being edited; leave out to register a new patient. */
  patient?: PatientRecord;
  onSaved: (patient: PatientRecord) => void;
  onCancel?: () => void;
  /** Edit only: fetches the newest version after a stale-edit refusal. */
  loadLatest?: () => Promise<PatientRecord>;
}

const IDENTITY = ['familyName', 'givenName', 'birthDate'] as const;

function formValues(p?: PatientRecord): PatientFormValues {
  return {
    familyName: p?.familyName ?? '',
    givenName: p?.givenName ?? '',
    birthDate: p?.birthDate ?? '',
    sex: p?.sex ?? (undefined as unknown as PatientFormValues['sex']),
    email: p?.email ?? '',
    phone: p?.phone ?? '',
    addressLine: p?.addressLine ?? '',
    city: p?.city ?? '',
    postalCode: p?.postalCode ?? '',
  };
}

/** Accessibility attributes of a control with an error shown under it by <Field>. */
const described = (id: string, error?: FieldError) => ({ 'aria-invalid': !!error, 'aria-describedby': error ? `${id}-error` : undefined });

/**
 * Registers a new patient or edits one. Before saving it asks the server for likely
 * duplicates and, if there are any, shows them and waits for a deliberate choice; the server
 * enforces the same rule. An edit carries the version it started from, so a concurrent
 * change is refused (409) and the form keeps what was typed.
 */
export function PatientForm({ patient, onSaved, onCancel, loadLatest }: Props) {
  const editing = !!patient;
  const prefix = editing ? 'edit-patient' : 'new-patient';
  const client = useQueryClient();
  // The version this edit started from. Deliberately not following background refetches:
  // that would turn someone else's change into a silent overwrite.
  const [baseVersion, setBaseVersion] = useState(patient?.version ?? 0);
  const [baseIdentity, setBaseIdentity] = useState(() => IDENTITY.map((k) => patient?.[k] ?? '').join('|'));
  const [duplicates, setDuplicates] = useState<PatientSummary[] | null>(null);
  const [staleSeen, setStaleSeen] = useState(false);
  const [saving, setSaving] = useState(false);
  const {
    register,
    handleSubmit,
    setError,
    clearErrors,
    reset,
    setFocus,
    watch,
    formState: { errors, isSubmitting },
  } = useForm<PatientFormValues, unknown, PatientFields>({
    resolver: zodResolver(patientFieldsSchema),
    defaultValues: formValues(patient),
  });

  // A changed name or birth date makes an earlier duplicate warning (and confirmation) moot.
  useEffect(() => {
    const sub = watch((_, { name }) => {
      if (name && (IDENTITY as readonly string[]).includes(name)) setDuplicates(null);
    });
    return () => sub.unsubscribe();
  }, [watch]);

  const showProblem = (error: unknown) => {
    if (error instanceof ApiError) {
      const entries = Object.entries(error.fields);
      entries.forEach(([field, message], i) => setError(field as keyof PatientFormValues, { message }, { shouldFocus: i === 0 }));
      setError('root', { message: error.message });
      if (error.code === 'STALE') setStaleSeen(true);
    } else setError('root', { message: 'The patient could not be saved. Nothing was changed.' });
  };

  const askDuplicates = (v: PatientFields) =>
    client.fetchQuery(
      patientDuplicatesQuery({ familyName: v.familyName, givenName: v.givenName, birthDate: v.birthDate, ...(patient ? { excludeId: patient.id } : {}) }),
    );

  const save = async (values: PatientFields, confirmed: boolean) => {
    clearErrors('root');
    setSaving(true);
    try {
      const identityChanged = IDENTITY.map((k) => values[k]).join('|') !== baseIdentity;
      if (!confirmed && identityChanged) {
        const candidates = await askDuplicates(values);
        if (candidates.length) {
          setDuplicates(candidates);
          return;
        }
      }
      const extra = confirmed ? { confirmedNotDuplicate: true } : {};
      const saved = patient
        ? (await api<{ patient: PatientRecord }>(`/api/patients/${patient.id}`, { method: 'PATCH', body: { ...values, ...extra, version: baseVersion } })).patient
        : (await api<{ patient: PatientRecord }>('/api/patients', { method: 'POST', body: { ...values, ...extra } })).patient;
      setDuplicates(null);
      void client.invalidateQueries({ queryKey: ['patients'] });
      setBaseVersion(saved.version);
      setBaseIdentity(IDENTITY.map((k) => saved[k]).join('|'));
      onSaved(saved);
    } catch (error) {
      // Someone registered the same person between our check and our save: show who.
      if (error instanceof ApiError && error.code === 'POSSIBLE_DUPLICATE') {
        try {
          setDuplicates(await askDuplicates(values));
          return;
        } catch (again) {
          showProblem(again);
          return;
        }
      }
      showProblem(error);
    } finally {
      setSaving(false);
    }
  };

  const reload = async () => {
    if (!loadLatest) return;
    try {
      const latest = await loadLatest();
      reset(formValues(latest));
      setBaseVersion(latest.version);
      setBaseIdentity(IDENTITY.map((k) => latest[k]).join('|'));
      setStaleSeen(false);
      setDuplicates(null);
      setFocus('familyName');
    } catch (error) {
      showProblem(error);
    }
  };

  const busy = isSubmitting || saving;
  const today = latestCalendarDate();
  const title = editing ? 'Edit patient details' : 'New patient';

  return (
    <form
      className="card grid gap-4 p-5 sm:grid-cols-2"
      noValidate
      aria-label={title}
      onSubmit={handleSubmit((v) => save(v, false))}
    >
      <h2 className="text-base font-semibold sm:col-span-2">{title}</h2>
      {errors.root && (
        <div role="alert" className="rounded-md bg-high-50 px-3 py-2 text-sm text-high-800 sm:col-span-2">
          <p>{errors.root.message}</p>
          {staleSeen && loadLatest && (
            <p className="mt-2">
              Your changes are still in the form. Copy what you need, then{' '}
              <button type="button" className="font-semibold underline underline-offset-2" onClick={() => void reload()}>
                load the latest version
              </button>{' '}
              (this replaces what you typed).
            </p>
          )}
        </div>
      )}

      <Field id={`${prefix}-family`} label="Family name" error={errors.familyName?.message}>
        <input id={`${prefix}-family`} className="field-input" autoComplete="off" {...register('familyName')} {...described(`${prefix}-family`, errors.familyName)} />
      </Field>
      <Field id={`${prefix}-given`} label="Given name" error={errors.givenName?.message}>
        <input id={`${prefix}-given`} className="field-input" autoComplete="off" {...register('givenName')} {...described(`${prefix}-given`, errors.givenName)} />
      </Field>
      <Field id={`${prefix}-birth`} label="Birth date" error={errors.birthDate?.message}>
        <input
          id={`${prefix}-birth`}
          type="date"
          className="field-input"
          min={EARLIEST_BIRTH_DATE}
          max={today}
          {...register('birthDate')}
          {...described(`${prefix}-birth`, errors.birthDate)}
        />
      </Field>
      <fieldset aria-describedby={errors.sex ? `${prefix}-sex-error` : undefined}>
        <legend className="field-label">Sex</legend>
        <div className="mt-2 flex flex-wrap gap-x-4 gap-y-2">
          {SEXES.map((s) => (
            <label key={s} className="inline-flex items-center gap-1.5 text-sm text-ink-800">
              <input type="radio" value={s} className="accent-crest-600" {...register('sex')} aria-invalid={!!errors.sex} />
              {SEX_LABELS[s]}
            </label>
          ))}
        </div>
        {errors.sex && <p id={`${prefix}-sex-error`} className="field-error" role="alert">{errors.sex.message}</p>}
      </fieldset>

      {duplicates && duplicates.length > 0 && (
        <DuplicateWarning
          candidates={duplicates}
          saving={busy}
          onConfirm={() => void handleSubmit((v) => save(v, true))()}
          onDismiss={() => {
            setDuplicates(null);
            setFocus('familyName');
          }}
        />
      )}

      <Field id={`${prefix}-phone`} label="Phone" error={errors.phone?.message}>
        <input id={`${prefix}-phone`} type="tel" className="field-input" autoComplete="off" {...register('phone')} {...described(`${prefix}-phone`, errors.phone)} />
      </Field>
      <Field id={`${prefix}-email`} label="E-mail (optional)" error={errors.email?.message}>
        <input id={`${prefix}-email`} type="email" className="field-input" autoComplete="off" {...register('email')} {...described(`${prefix}-email`, errors.email)} />
      </Field>
      <div className="sm:col-span-2">
        <Field id={`${prefix}-address`} label="Address" error={errors.addressLine?.message}>
          <input id={`${prefix}-address`} className="field-input" autoComplete="off" {...register('addressLine')} {...described(`${prefix}-address`, errors.addressLine)} />
        </Field>
      </div>
      <Field id={`${prefix}-city`} label="City" error={errors.city?.message}>
        <input id={`${prefix}-city`} className="field-input" autoComplete="off" {...register('city')} {...described(`${prefix}-city`, errors.city)} />
      </Field>
      <Field id={`${prefix}-postal`} label="Postal code" error={errors.postalCode?.message}>
        <input id={`${prefix}-postal`} className="field-input" autoComplete="off" {...register('postalCode')} {...described(`${prefix}-postal`, errors.postalCode)} />
      </Field>

      <div className="flex flex-wrap gap-2 sm:col-span-2">
        <button type="submit" className="btn-primary" disabled={busy || (duplicates?.length ?? 0) > 0}>
          {busy ? 'Saving…' : editing ? 'Save changes' : 'Save patient'}
        </button>
        {onCancel && (
          <button type="button" className="btn-quiet" onClick={onCancel}>
            Cancel
          </button>
        )}
      </div>
    </form>
  );
}
