import { Op, type Order, type Transaction, type WhereOptions } from 'sequelize';
import { db } from '../../db/connection';
import { Exam, ExamType, Patient, Room } from '../../db/models';
import { mrnFromNumber } from '../../lib/identifiers';
import type { SessionUser } from '../../lib/session-user';
import { zonedClock, zonedDate } from '../../lib/time';
import { parsePatientSearch } from '../../lib/schemas/patient-search';
import {
  PATIENT_FIELDS,
  type CreatePatientInput,
  type DuplicateQuery,
  type PatientExamRow,
  type PatientFields,
  type PatientListQuery,
  type PatientListResult,
  type PatientRecord,
  type PatientSummary,
  type UpdatePatientInput,
} from '../../lib/schemas/patients';
import { HttpError, notFound, stale } from '../http/errors';
import { audit } from './audit';
import { nextValue } from './sequences';

function toSummary(p: Patient): PatientSummary {
  return {
    id: p.id,
    mrn: p.mrn,
    familyName: p.familyName,
    givenName: p.givenName,
    birthDate: p.birthDate,
    sex: p.sex,
    city: p.city,
  };
}

function toRecord(p: Patient): PatientRecord {
  return { ...toSummary(p), email: p.email, phone: p.phone, addressLine: p.addressLine, postalCode: p.postalCode, version: p.version };
}

/** Escapes LIKE's wildcards (and its escape character) in user text, e.g. "50%_" → "50\%\_". */
export function escapeLike(text: string): string {
  return text.replace(/[\\%_]/g, (c) => '\\' + c);
}

const SUMMARY_ATTRIBUTES = ['id', 'mrn', 'familyName', 'givenName', 'birthDate', 'sex', 'city'] as const;

/**
 * One page of patients for the search box: an MRN matches exactly (unique index), a birth
 * date exactly (patients_birth_date), and each name word must start the family name
 * (patients_name, a range scan) or the given name. Collation utf8mb4_unicode_ci makes all of
 * it case- and accent-insensitive.
 */
export async function searchPatients(q: PatientListQuery): Promise<PatientListResult> {
  const search = parsePatientSearch(q.q);
  let where: WhereOptions<Patient> = {};
  switch (search.kind) {
    case 'invalidDate':
      return { rows: [], total: 0, search };
    case 'mrn':
      where = { mrn: search.mrn };
      break;
    case 'birthDate':
      where = { birthDate: search.birthDate };
      break;
    case 'name':
      where = {
        [Op.and]: search.words.map((word) => ({
          [Op.or]: [{ familyName: { [Op.like]: `${escapeLike(word)}%` } }, { givenName: { [Op.like]: `${escapeLike(word)}%` } }],
        })),
      };
      break;
    case 'all':
      break;
  }
  const dir = q.dir.toUpperCase();
  const order: Order =
    q.sort === 'name'
      ? [['familyName', dir], ['givenName', dir], ['id', dir]]
      : q.sort === 'birthDate'
        ? [['birthDate', dir], ['familyName', 'ASC'], ['givenName', 'ASC'], ['id', 'ASC']]
        : [[q.sort, dir], ['id', dir]];
  const { rows, count } = await Patient.findAndCountAll({
    where,
    attributes: [...SUMMARY_ATTRIBUTES],
    order,
    limit: q.pageSize,
    offset: (q.page - 1) * q.pageSize,
  });
  return { rows: rows.map(toSummary), total: count, search };
}

/** A patient record, or null when there is none with that id. */
export async function findPatient(id: number): Promise<PatientRecord | null> {
  const p = await Patient.findByPk(id);
  return p ? toRecord(p) : null;
}

/** A patient record; 404 when there is none. */
export async function getPatient(id: number): Promise<PatientRecord> {
  const p = await findPatient(id);
  if (!p) throw notFound('The patient');
  return p;
}

/**
 * Records that are likely the same person: same family and given name (the collation
 * ignores case and accents) and same birth date, or the same MRN. Newest MRN first.
 */
export async function findDuplicates(q: DuplicateQuery, transaction?: Transaction): Promise<PatientSummary[]> {
  const alternatives: WhereOptions<Patient>[] = [];
  if (q.familyName && q.givenName && q.birthDate) {
    alternatives.push({ familyName: q.familyName, givenName: q.givenName, birthDate: q.birthDate });
  }
  if (q.mrn) alternatives.push({ mrn: q.mrn });
  if (alternatives.length === 0) return [];
  const rows = await Patient.findAll({
    where: { [Op.and]: [{ [Op.or]: alternatives }, ...(q.excludeId ? [{ id: { [Op.ne]: q.excludeId } }] : [])] },
    attributes: [...SUMMARY_ATTRIBUTES],
    order: [['mrn', 'DESC']],
    limit: 10,
    transaction,
  });
  return rows.map(toSummary);
}

/** The 409 that asks for a deliberate "this is a different person". */
function possibleDuplicate(candidates: PatientSummary[]): HttpError {
  return new HttpError(
    409,
    'POSSIBLE_DUPLICATE',
    candidates.length === 1
      ? 'A patient with the same name and birth date already has a record. Open it, or confirm that this is a different person.'
      : `${candidates.length} patients with the same name and birth date already have records. Open one, or confirm that this is a different person.`,
    undefined,
    // Only what a person needs to tell the records apart; never addresses or contact details.
    { candidates: candidates.map(({ id, mrn, familyName, givenName, birthDate }) => ({ id, mrn, familyName, givenName, birthDate })) },
  );
}

/** The names of the fields an input sets to a value different from the record's. */
function changedFields(patient: Patient | null, input: Partial<PatientFields>): Array<keyof PatientFields> {
  return PATIENT_FIELDS.filter((k) => input[k] !== undefined && (patient === null || input[k] !== patient[k]));
}

/**
 * Creates a patient with a new MRN (audited). Refuses a likely duplicate with 409
 * POSSIBLE_DUPLICATE unless the person confirmed that this is someone else.
 */
export async function createPatient(actor: SessionUser, input: CreatePatientInput, requestId: string): Promise<PatientRecord> {
  const { confirmedNotDuplicate, ...fields } = input;
  return db().transaction(async (transaction) => {
    // The MRN comes first: it locks the counter row until this transaction ends, so patient
    // creation runs one at a time from here and the duplicate check below sees every record
    // committed before this one (two desks registering the same person at once get one 201
    // and one 409, not two records).
    const mrn = mrnFromNumber(await nextValue('mrn', transaction));
    if (!confirmedNotDuplicate) {
      const candidates = await findDuplicates(fields, transaction);
      if (candidates.length) throw possibleDuplicate(candidates);
    }
    const patient = await Patient.create({ ...fields, mrn }, { transaction });
    await audit(
      {
        actorUserId: actor.id,
        action: 'patient.create',
        entityType: 'patient',
        entityId: patient.id,
        // Field names only: the values are patient data and stay out of the audit trail.
        detail: { fields: changedFields(null, fields).filter((k) => fields[k] !== null), ...(confirmedNotDuplicate ? { confirmedNotDuplicate: true } : {}) },
        requestId,
      },
      transaction,
    );
    return toRecord(patient);
  });
}

/**
 * Changes a patient record, refusing a stale version (409 STALE) and, when the name or birth
 * date changes to match another record, a likely duplicate unless confirmed.
 */
export async function updatePatient(actor: SessionUser, id: number, input: UpdatePatientInput, requestId: string): Promise<PatientRecord> {
  const { version, confirmedNotDuplicate, ...fields } = input;
  return db().transaction(async (transaction) => {
    const patient = await Patient.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!patient) throw notFound('The patient');
    if (patient.version !== version) throw stale('patient record');
    const changed = changedFields(patient, fields);
    if (changed.length === 0) return toRecord(patient);

    if (!confirmedNotDuplicate && changed.some((k) => k === 'familyName' || k === 'givenName' || k === 'birthDate')) {
      const candidates = await findDuplicates(
        {
          familyName: fields.familyName ?? patient.familyName,
          givenName: fields.givenName ?? patient.givenName,
          birthDate: fields.birthDate ?? patient.birthDate,
          excludeId: patient.id,
        },
        transaction,
      );
      if (candidates.length) throw possibleDuplicate(candidates);
    }
    await patient.update({ ...Object.fromEntries(changed.map((k) => [k, fields[k]])), version: patient.version + 1 }, { transaction });
    await audit(
      {
        actorUserId: actor.id,
        action: 'patient.update',
        entityType: 'patient',
        entityId: patient.id,
        detail: { fields: changed, ...(confirmedNotDuplicate ? { confirmedNotDuplicate: true } : {}) },
        requestId,
      },
      transaction,
    );
    return toRecord(patient);
  });
}

/** A patient's exams, newest first, with date and time in the clinic's time zone. */
export async function listPatientExams(patientId: number, timeZone: string, limit = 200): Promise<PatientExamRow[]> {
  const rows = await Exam.findAll({
    where: { patientId },
    include: [
      { model: ExamType, as: 'examType', attributes: ['name'] },
      { model: Room, as: 'room', attributes: ['name'] },
    ],
    order: [['scheduledStart', 'DESC'], ['id', 'DESC']],
    limit,
  });
  return rows.map((e) => {
    const r = e as Exam & { examType: ExamType; room: Room };
    return {
      id: r.id,
      accessionNumber: r.accessionNumber,
      date: zonedDate(r.scheduledStart, timeZone),
      time: zonedClock(r.scheduledStart, timeZone),
      examType: r.examType.name,
      room: r.room.name,
      status: r.status,
    };
  });
}
