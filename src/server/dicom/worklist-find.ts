import { QueryTypes } from 'sequelize';
import { db } from '../../db/connection';
import { addDays, zonedClock, zonedDate, zonedTimeToUtc } from '../../lib/time';
import { trimDicom } from './identifiers';

/**
 * Modality Worklist (PS3.4 annex K, Basic Worklist Management, C-FIND): the scanner asks for
 * scheduled steps with matching keys, and gets one answer per booked or arrived exam, carrying
 * the keys it asked for. Query values arrive padded; they are trimmed before matching.
 *
 * Matching supported: Scheduled Station AE Title, Scheduled Procedure Step Start Date (one day
 * or a range, in the clinic's time zone, since DICOM dates are local), Modality, Patient's Name
 * and Patient ID and Accession Number with `*` and `?` wildcards. Names match without regard to
 * case (scanner keyboards are awkward; the clinic's database collation is case-insensitive too).
 * Other keys in a query are return keys only.
 */

export interface WorklistQuery {
  stationAeTitle: string | null;
  dateFrom: string | null;
  dateTo: string | null;
  modality: string | null;
  patientName: string | null;
  patientId: string | null;
  accessionNumber: string | null;
}

/** A query value as text: dcmjs gives strings, arrays of strings, or person-name objects. */
export function queryText(value: unknown): string {
  if (value == null) return '';
  if (Array.isArray(value)) return value.length ? queryText(value[0]) : '';
  if (typeof value === 'object') return queryText((value as { Alphabetic?: unknown }).Alphabetic);
  return trimDicom(String(value));
}

/** A DICOM wildcard value as a LIKE pattern, e.g. "O'BR*^AN?" → "O'BR%^AN_" (LIKE's own % _ \ escaped). */
export function wildcardToLike(value: string): string {
  return value.replace(/[\\%_]/g, (c) => `\\${c}`).replace(/\*/g, '%').replace(/\?/g, '_');
}

/** True when a value matches everything ("" or only asterisks): no condition needed. */
const universal = (value: string | null): boolean => value === null || /^\**$/.test(value);

/**
 * A DA value or range as clinic-local ISO days, e.g. "20261203" → both ends that day,
 * "20261201-20261207", "-20261207", "20261201-". Null when the value is not a date or range.
 */
export function parseDateRange(value: string): { from: string | null; to: string | null } | null {
  const day = (d: string) => {
    if (d === '') return '';
    const m = /^(\d{4})(\d{2})(\d{2})$/.exec(d);
    if (!m) return null;
    const iso = `${m[1]}-${m[2]}-${m[3]}`;
    return Number.isNaN(Date.parse(`${iso}T00:00:00Z`)) ? null : iso;
  };
  const v = value.replace(/\./g, '');
  const parts = v.includes('-') ? v.split('-') : [v, v];
  if (parts.length !== 2) return null;
  const [from, to] = parts.map(day);
  if (from === null || to === null || (from === '' && to === '')) return null;
  return { from: from || null, to: to || null };
}

/** Reads the matching keys of a worklist query (naturalized by dcmjs). Null when a key is malformed. */
export function readQuery(elements: Record<string, unknown>): WorklistQuery | { invalid: string } {
  const steps = elements.ScheduledProcedureStepSequence;
  const step = (Array.isArray(steps) ? steps[0] : steps) as Record<string, unknown> | undefined;
  const dateText = queryText(step?.ScheduledProcedureStepStartDate);
  const range = dateText === '' ? { from: null, to: null } : parseDateRange(dateText);
  if (!range) return { invalid: 'Scheduled Procedure Step Start Date is not a date or date range (YYYYMMDD or YYYYMMDD-YYYYMMDD).' };
  const orNull = (v: string) => (v === '' ? null : v);
  return {
    stationAeTitle: orNull(queryText(step?.ScheduledStationAETitle)),
    dateFrom: range.from,
    dateTo: range.to,
    modality: orNull(queryText(step?.Modality)),
    patientName: orNull(queryText(elements.PatientName)),
    patientId: orNull(queryText(elements.PatientID)),
    accessionNumber: orNull(queryText(elements.AccessionNumber)),
  };
}

export interface WorklistRow {
  accession_number: string;
  study_instance_uid: string;
  scheduled_start: Date;
  mrn: string;
  family_name: string;
  given_name: string;
  birth_date: string;
  sex: string;
  type_name: string;
  type_code: string;
  referrer_name: string | null;
  ae_title: string;
  room_name: string;
  sonographer_name: string;
  height_cm: number | null;
  weight_kg: number | null;
}

/** The rows a query selects: booked and arrived exams only, in start order. */
export async function worklistRows(q: WorklistQuery, timeZone: string): Promise<WorklistRow[]> {
  const where = ["e.status IN ('booked', 'arrived')", 's.active = 1'];
  const values: unknown[] = [];
  if (q.modality !== null && !universal(q.modality) && !likeMatches('US', q.modality)) return [];
  const like = (column: string, value: string | null) => {
    if (universal(value)) return;
    if (/[*?]/.test(value!)) {
      where.push(`${column} LIKE ?`);
      values.push(wildcardToLike(value!));
    } else {
      where.push(`${column} = ?`);
      values.push(value);
    }
  };
  like('s.ae_title', q.stationAeTitle);
  like('p.mrn', q.patientId);
  like('e.accession_number', q.accessionNumber);
  // Patient's Name is matched on its DICOM form, FAMILY^GIVEN.
  like("CONCAT(p.family_name, '^', p.given_name)", q.patientName);
  if (q.dateFrom) {
    where.push('e.scheduled_start >= ?');
    values.push(zonedTimeToUtc(q.dateFrom, 0, 0, timeZone));
  }
  if (q.dateTo) {
    where.push('e.scheduled_start < ?');
    values.push(zonedTimeToUtc(addDays(q.dateTo, 1), 0, 0, timeZone));
  }
  // Height and weight as last measured for this patient (entered on a report), for BSA.
  const lastReportOf = `SELECT r.%s FROM reports r JOIN exams e2 ON e2.id = r.exam_id WHERE e2.patient_id = e.patient_id AND r.%s IS NOT NULL ORDER BY e2.scheduled_start DESC LIMIT 1`;
  return db().query<WorklistRow>(
    `SELECT e.accession_number, e.study_instance_uid, e.scheduled_start, p.mrn, p.family_name, p.given_name, p.birth_date, p.sex,
            t.name AS type_name, t.code AS type_code, rf.name AS referrer_name, s.ae_title, rm.name AS room_name, u.display_name AS sonographer_name,
            (${lastReportOf.replaceAll('%s', 'height_cm')}) AS height_cm, (${lastReportOf.replaceAll('%s', 'weight_kg')}) AS weight_kg
       FROM exams e
       JOIN patients p ON p.id = e.patient_id
       JOIN exam_types t ON t.id = e.exam_type_id
       JOIN scanners s ON s.id = e.scanner_id
       JOIN rooms rm ON rm.id = e.room_id
       JOIN users u ON u.id = e.sonographer_id
       LEFT JOIN referrers rf ON rf.id = e.referrer_id
      WHERE ${where.join(' AND ')}
      ORDER BY e.scheduled_start, e.id`,
    { replacements: values, type: QueryTypes.SELECT },
  );
}

/** Whether a literal matches a DICOM wildcard value (for keys answered without the database). */
export function likeMatches(literal: string, pattern: string): boolean {
  const re = new RegExp(`^${pattern.replace(/[.+^${}()|[\]\\]/g, '\\$&').replace(/\*/g, '.*').replace(/\?/g, '.')}$`, 'i');
  return re.test(literal);
}

/** A DICOM person name (PS3.5 6.2, PN): components joined by ^, with the separators removed from the parts. */
export function personName(family: string, given = '', prefix = ''): string {
  const clean = (s: string) => s.replace(/[\^=\\]/g, ' ').trim();
  const parts = [clean(family), clean(given), '', clean(prefix)];
  while (parts.length && parts[parts.length - 1] === '') parts.pop();
  return parts.join('^');
}

/** "Dr Mira Castellan" → "Castellan^Mira^^Dr": the last word is the family name. */
export function personNameFromDisplay(display: string): string {
  const words = display.trim().split(/\s+/);
  const prefix = /^(Dr|Prof|Mr|Mrs|Ms|Mx)\.?$/i.test(words[0] ?? '') ? words.shift()! : '';
  const family = words.pop() ?? '';
  return personName(family, words.join(' '), prefix);
}

const SEX_CODES: Record<string, string> = { female: 'F', male: 'M', other: 'O' };
const da = (isoDay: string) => isoDay.replace(/-/g, '');
const ds = (n: number, decimals: number) => String(Number(n.toFixed(decimals)));

/** One worklist answer with every key Crestline can give, naturalized for dcmjs. */
export function worklistItem(r: WorklistRow, timeZone: string, ourAeTitle: string): Record<string, unknown> {
  const day = zonedDate(r.scheduled_start, timeZone);
  return {
    SpecificCharacterSet: 'ISO_IR 192',
    PatientName: personName(r.family_name, r.given_name),
    PatientID: r.mrn,
    IssuerOfPatientID: ourAeTitle,
    PatientBirthDate: da(r.birth_date),
    PatientSex: SEX_CODES[r.sex] ?? '',
    // Patient's Size is in metres (PS3.3 C.7.2.2).
    ...(r.height_cm != null ? { PatientSize: ds(r.height_cm / 100, 2) } : {}),
    ...(r.weight_kg != null ? { PatientWeight: ds(r.weight_kg, 1) } : {}),
    AccessionNumber: r.accession_number,
    StudyInstanceUID: r.study_instance_uid,
    RequestedProcedureID: r.accession_number,
    RequestedProcedureDescription: r.type_name,
    ReferringPhysicianName: r.referrer_name ? personNameFromDisplay(r.referrer_name) : '',
    ScheduledProcedureStepSequence: [
      {
        Modality: 'US',
        ScheduledStationAETitle: r.ae_title,
        ScheduledStationName: r.room_name.slice(0, 16),
        ScheduledProcedureStepStartDate: da(day),
        ScheduledProcedureStepStartTime: `${zonedClock(r.scheduled_start, timeZone).replace(':', '')}00`,
        ScheduledPerformingPhysicianName: personNameFromDisplay(r.sonographer_name),
        ScheduledProcedureStepDescription: r.type_name,
        ScheduledProcedureStepID: r.accession_number,
      },
    ],
  };
}

/**
 * The answer trimmed to the keys the query asked for (PS3.4 C.2.2.1.2: return keys). A sequence
 * asked for with an item returns that item's keys; asked for empty, the whole item. Keys Crestline
 * does not hold come back empty, as the standard asks. The character set always comes back.
 */
export function requestedOnly(item: Record<string, unknown>, query: Record<string, unknown>): Record<string, unknown> {
  const out: Record<string, unknown> = { SpecificCharacterSet: item.SpecificCharacterSet };
  for (const key of Object.keys(query)) {
    if (key === 'SpecificCharacterSet' || key === '_vrMap') continue;
    const asked = query[key];
    const have = item[key];
    if (Array.isArray(have) && have.length && typeof have[0] === 'object') {
      const wanted = (Array.isArray(asked) ? asked[0] : asked) as Record<string, unknown> | undefined;
      out[key] = have.map((h) => (wanted && Object.keys(wanted).length ? requestedOnly(h as Record<string, unknown>, wanted) : h));
      if (wanted && Object.keys(wanted).length) for (const i of out[key] as Record<string, unknown>[]) delete i.SpecificCharacterSet;
    } else if (Array.isArray(asked) && (asked.length === 0 || typeof asked[0] === 'object') && have === undefined) {
      out[key] = [];
    } else {
      out[key] = have ?? '';
    }
  }
  return out;
}
