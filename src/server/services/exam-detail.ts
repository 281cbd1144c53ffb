import { Op, literal } from 'sequelize';
import { AuditEvent, Exam, ExamType, OutboxMessage, Patient, Referrer, Room, Scanner, User } from '../../db/models';
import type { ExamStatus, PaymentState, Payer, Priority } from '../../lib/exam-status';
import { ageOn, formatInstant, zonedDate } from '../../lib/time';
import { notFound } from '../http/errors';
import { examLedger, type LedgerRow } from './payments';

export interface ExamDetail {
  id: number;
  accessionNumber: string;
  studyInstanceUid: string;
  status: ExamStatus;
  priority: Priority;
  payer: Payer;
  paymentState: PaymentState;
  version: number;
  start: string;
  when: string;
  durationMinutes: number;
  indication: string;
  cancelReason: string | null;
  priceCents: number;
  depositCents: number;
  currency: string;
  patient: { id: number; name: string; mrn: string; birthDate: string; ageYears: number; sex: string; email: string | null };
  examType: { id: number; name: string; preparationText: string };
  room: { id: number; name: string };
  scanner: { id: number; name: string; aeTitle: string };
  sonographer: { id: number; name: string };
  referrer: { id: number; name: string; practice: string } | null;
  ledger: LedgerRow[];
  messages: Array<{ id: number; kind: string; status: string; to: string; at: string; sentAt: string | null; attempts: number }>;
  history: Array<{ at: string; action: string; actor: string | null }>;
}

/** A scanner's own steps (procedure steps, received images) name it as the actor, e.g. "scanner FHUS01". */
function scannerOf(detail: unknown): string | null {
  const ae = (detail as { scannerAe?: unknown } | null)?.scannerAe;
  return typeof ae === 'string' ? `scanner ${ae}` : null;
}

/** Everything the exam page shows, for staff. */
export async function examDetail(id: number, timeZone: string): Promise<ExamDetail> {
  const e = (await Exam.findByPk(id, {
    include: [
      { model: Patient, as: 'patient' },
      { model: ExamType, as: 'examType' },
      { model: Room, as: 'room' },
      { model: Scanner, as: 'scanner' },
      { model: User, as: 'sonographer', attributes: ['id', 'displayName'] },
      { model: Referrer, as: 'referrer' },
    ],
  })) as (Exam & { patient: Patient; examType: ExamType; room: Room; scanner: Scanner; sonographer: User; referrer: Referrer | null }) | null;
  if (!e) throw notFound('The exam');
  const [ledger, messages, events] = await Promise.all([
    examLedger(e.id),
    OutboxMessage.findAll({ where: { examId: e.id }, order: [['id', 'ASC']], attributes: ['id', 'kind', 'status', 'toAddress', 'createdAt', 'sentAt', 'attempts'] }),
    AuditEvent.findAll({
      where: {
        [Op.or]: [
          { entityType: 'exam', entityId: String(e.id) },
          // Money movements are audited on the payment; they name their exam in the detail.
          { [Op.and]: [{ entityType: 'payment' }, literal(`JSON_VALUE(detail, '$.examId') = ${Number(e.id)}`)] },
        ],
      },
      order: [['id', 'ASC']],
      limit: 200,
    }),
  ]);
  const actors = new Map((await User.findAll({ where: { id: [...new Set(events.map((x) => x.actorUserId).filter((x): x is number => x != null))] }, attributes: ['id', 'displayName'] })).map((u) => [u.id, u.displayName]));
  return {
    id: e.id,
    accessionNumber: e.accessionNumber,
    studyInstanceUid: e.studyInstanceUid,
    status: e.status,
    priority: e.priority,
    payer: e.payer,
    paymentState: e.paymentState,
    version: e.version,
    start: e.scheduledStart.toISOString(),
    when: formatInstant(e.scheduledStart, timeZone),
    durationMinutes: e.durationMinutes,
    indication: e.indication,
    cancelReason: e.cancelReason,
    priceCents: e.priceCents,
    depositCents: e.depositCents,
    currency: e.currency,
    patient: {
      id: e.patient.id,
      name: `${e.patient.familyName}, ${e.patient.givenName}`,
      mrn: e.patient.mrn,
      birthDate: e.patient.birthDate,
      ageYears: ageOn(e.patient.birthDate, zonedDate(e.scheduledStart, timeZone)),
      sex: e.patient.sex,
      email: e.patient.email,
    },
    examType: { id: e.examType.id, name: e.examType.name, preparationText: e.examType.preparationText },
    room: { id: e.room.id, name: e.room.name },
    scanner: { id: e.scanner.id, name: e.scanner.name, aeTitle: e.scanner.aeTitle },
    sonographer: { id: e.sonographer.id, name: e.sonographer.displayName },
    referrer: e.referrer ? { id: e.referrer.id, name: e.referrer.name, practice: e.referrer.practice } : null,
    ledger,
    messages: messages.map((m) => ({ id: m.id, kind: m.kind, status: m.status, to: m.toAddress, at: m.createdAt.toISOString(), sentAt: m.sentAt?.toISOString() ?? null, attempts: m.attempts })),
    history: events.map((x) => ({ at: x.at.toISOString(), action: x.action, actor: x.actorUserId != null ? (actors.get(x.actorUserId) ?? null) : scannerOf(x.detail) })),
  };
}
