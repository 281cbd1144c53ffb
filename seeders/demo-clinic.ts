import { Faker, en } from '@faker-js/faker';
import type { Sequelize, Transaction } from 'sequelize';
import { createHash } from 'node:crypto';
import { Exam, ExamType, Patient, Payment, Probe, Referrer, Room, Scanner, Setting, User } from '../src/db/models';
import { hashPassword } from '../src/server/auth/password';
import { raiseTo } from '../src/server/services/sequences';
import { DEFAULT_CLINIC_HOURS, DEFAULT_PAYMENT_POLICY } from '../src/lib/schemas/settings';
import type { ExamStatus, Sex } from '../src/lib/exam-status';
import type { Role } from '../src/lib/roles';
import { accessionFrom, mrnFromNumber, uidFromUuid } from '../src/lib/identifiers';
import { addDays, zonedDate, zonedTimeToUtc } from '../src/lib/time';
import { CLINIC, DEMO_PASSWORD, DEMO_USERS, EXAM_TYPES, INDICATIONS, ROOMS } from './demo-clinic-data';
import { getTemplate, type PriorExamInput, type TemplateId } from '../src/lib/clinical';
import { demoEntries, earlierEntries, seedReport, type DemoEntries } from './demo-reports';

/**
 * The invented demo clinic: everything a person needs to try Crestline. Deterministic for a
 * given day (seeded faker; exams placed relative to "today" in the clinic's time zone).
 */
export async function seedDemoClinic(sequelize: Sequelize, now = new Date()): Promise<void> {
  const faker = new Faker({ locale: [en] });
  faker.seed(20261202);
  const passwordHash = await hashPassword(DEMO_PASSWORD);

  await sequelize.transaction(async (transaction) => {
    await Setting.create({ key: 'clinic', value: CLINIC }, { transaction });
    await Setting.create({ key: 'clinic.hours', value: DEFAULT_CLINIC_HOURS }, { transaction });
    await Setting.create({ key: 'payments.policy', value: DEFAULT_PAYMENT_POLICY }, { transaction });

    const referrers = await seedReferrers(faker, transaction);
    const users = new Map<string, User>();
    for (const u of DEMO_USERS) {
      const user = await User.create(
        {
          email: u.email,
          displayName: u.displayName,
          role: u.role as Role,
          passwordHash,
          referrerId: u.role === 'referrer' ? referrers[0]!.id : null,
        },
        { transaction },
      );
      users.set(u.key, user);
    }

    const types = new Map<string, ExamType>();
    for (const t of EXAM_TYPES) types.set(t.code, await ExamType.create({ ...t }, { transaction }));

    const rooms: Array<{ room: Room; scanner: Scanner; sonographer: User; examCodes: string[] }> = [];
    for (const [i, r] of ROOMS.entries()) {
      const room = await Room.create({ name: r.name }, { transaction });
      const scanner = await Scanner.create({ roomId: room.id, name: r.scanner, aeTitle: r.aeTitle }, { transaction });
      for (const [j, p] of r.probes.entries()) {
        await Probe.create(
          { ...p, scannerId: scanner.id, serialNumber: `FH-${p.kind.slice(0, 1).toUpperCase()}-${i + 1}${j + 1}07`, inServiceFrom: '2025-03-01', inServiceTo: null },
          { transaction },
        );
      }
      rooms.push({ room, scanner, sonographer: users.get(r.sonographer)!, examCodes: r.examCodes });
    }

    const patients = await seedPatients(faker, transaction);
    await raiseTo('mrn', patients.length, transaction);
    const reader = users.get('reader')!;
    await seedWeekOfExams(faker, { rooms, types, patients, referrers, now, reader: { id: reader.id, name: reader.displayName } }, transaction);
  });
}

async function seedReferrers(faker: Faker, transaction: Transaction): Promise<Referrer[]> {
  const out: Referrer[] = [];
  for (let i = 0; i < 10; i++) {
    const first = faker.person.firstName();
    const last = faker.person.lastName();
    const practice = `${faker.location.street()} ${faker.helpers.arrayElement(['Family Practice', 'Medical Group', 'Endocrine Clinic', 'Heart Practice', 'Health Centre'])}`;
    out.push(
      await Referrer.create(
        {
          name: `Dr ${first} ${last}`,
          practice,
          email: `${first}.${last}.${i}@referrers.test`.toLowerCase().replace(/[^a-z0-9.@]/g, ''),
          phone: `+1 555 01${String(10 + i).padStart(2, '0')} ${faker.string.numeric(3)}`,
        },
        { transaction },
      ),
    );
  }
  return out;
}

async function seedPatients(faker: Faker, transaction: Transaction): Promise<Patient[]> {
  const out: Patient[] = [];
  for (let i = 1; i <= 40; i++) {
    // Mostly female/male; a few records with another or unrecorded sex, as real lists have.
    const sex: Sex = i % 19 === 0 ? 'unknown' : i % 23 === 0 ? 'other' : i % 2 === 0 ? 'female' : 'male';
    const given = faker.person.firstName(sex === 'female' ? 'female' : sex === 'male' ? 'male' : undefined);
    const family = faker.person.lastName();
    out.push(
      await Patient.create(
        {
          mrn: mrnFromNumber(i),
          familyName: family,
          givenName: given,
          birthDate: faker.date.between({ from: '1938-01-01', to: '2006-12-31' }).toISOString().slice(0, 10),
          sex,
          email: i % 5 === 0 ? null : `${given}.${family}${i}@patients.test`.toLowerCase().replace(/[^a-z0-9.@]/g, ''),
          phone: `+1 555 02${String(i).padStart(2, '0')} ${faker.string.numeric(3)}`,
          addressLine: faker.location.streetAddress(),
          city: faker.helpers.arrayElement(['Alderbrook', 'Fernhollow', 'East Quillby', 'Marrow Bay']),
          postalCode: faker.string.numeric(5),
        },
        { transaction },
      ),
    );
  }
  return out;
}

interface WeekInput {
  rooms: Array<{ room: Room; scanner: Scanner; sonographer: User; examCodes: string[] }>;
  types: Map<string, ExamType>;
  patients: Patient[];
  referrers: Referrer[];
  now: Date;
  /** Signs the demo's earlier exams. */
  reader: { id: number; name: string };
}

/** Three days back to three days ahead, Monday to Saturday, each room filled with gaps. */
async function seedWeekOfExams(faker: Faker, w: WeekInput, transaction: Transaction): Promise<void> {
  const today = zonedDate(w.now, CLINIC.timeZone);
  const counters = new Map<string, number>();
  const baselines = new Map<string, { entries: DemoEntries; prior: PriorExamInput | null }>();
  for (let offset = -3; offset <= 3; offset++) {
    const day = addDays(today, offset);
    const weekday = new Date(day + 'T12:00:00Z').getUTCDay();
    if (weekday === 0) continue; // closed on Sundays
    const closeAt = weekday === 6 ? 12 * 60 : 17 * 60;
    // Each patient comes at most once a day.
    const queue = faker.helpers.shuffle([...w.patients]);
    for (const r of w.rooms) {
      let minute = 8 * 60;
      while (true) {
        const type = w.types.get(faker.helpers.arrayElement(r.examCodes))!;
        if (minute + type.durationMinutes > closeAt || queue.length === 0) break;
        const start = zonedTimeToUtc(day, Math.floor(minute / 60), minute % 60, CLINIC.timeZone);
        const n = (counters.get(day) ?? 0) + 1;
        counters.set(day, n);
        await raiseTo(`accession:${day}`, n, transaction);
        const status = statusFor(faker, start, type.durationMinutes, w.now);
        // Past exams were billed to insurers; about a third of those still ahead are self-pay
        // with the deposit not yet taken, so the desk has deposits to collect in the demo.
        const selfPay = status === 'booked' && faker.datatype.boolean(0.35);
        const patient = queue.pop()!;
        const referrerId = faker.helpers.arrayElement(w.referrers.slice(0, faker.datatype.boolean(0.3) ? 1 : 10)).id;
        const examRow = (at: Date, st: ExamStatus, accessionNumber: string, bookedAt: Date) => ({
          accessionNumber,
          patientId: patient.id,
          examTypeId: type.id,
          referrerId,
          roomId: r.room.id,
          scannerId: r.scanner.id,
          sonographerId: r.sonographer.id,
          scheduledStart: at,
          durationMinutes: type.durationMinutes,
          scheduledEnd: new Date(at.getTime() + type.durationMinutes * 60_000),
          status: st,
          payer: selfPay && st === 'booked' ? ('self-pay' as const) : ('insured' as const),
          depositCents: selfPay && st === 'booked' ? type.depositCents : 0,
          paymentState: selfPay && st === 'booked' && type.depositCents > 0 ? ('deposit-due' as const) : ('none' as const),
          createdBy: null,
          priority: faker.datatype.boolean(0.1) ? ('urgent' as const) : ('routine' as const),
          indication: faker.helpers.arrayElement(INDICATIONS[type.code] ?? ['Clinical assessment']),
          studyInstanceUid: uidFromUuid(faker.string.uuid()),
          priceCents: type.selfPayPriceCents,
          currency: type.currency,
          cancelReason: st === 'cancelled' ? 'Patient asked to rebook' : null,
          createdAt: bookedAt,
          // Checked in a few minutes early and started on time or a little late (from the
          // accession counter, not the faker, so the rest of the demo stays as it was).
          ...(st === 'completed' || st === 'in-progress'
            ? { arrivedAt: new Date(at.getTime() - (4 + (n % 12)) * 60_000), startedAt: new Date(at.getTime() + (n % 7) * 60_000) }
            : {}),
        });
        // Booked one to three weeks before the exam (and never after now), so the age of
        // each request in the reading queue and the turnaround figures look like a clinic's.
        const bookedAt = new Date(Math.min(start.getTime(), w.now.getTime()) - faker.number.int({ min: 1 * 24 * 60, max: 21 * 24 * 60 }) * 60_000);
        const exam = await Exam.create(examRow(start, status, accessionFrom(day, n), bookedAt), { transaction });
        // One in three of the week's scanned patients paid themselves: the deposit when booking,
        // the balance after the scan (the takings on the manager's dashboard).
        if (status === 'completed' && n % 3 === 0) await seedPaidInFull(exam, type, transaction);
        if (status === 'completed' || status === 'in-progress') {
          // Some thyroid and abdomen patients were scanned here before: signed priors to compare with.
          // A patient seen twice this week for the same exam keeps the same values and history.
          const template = getTemplate(type.templateId as TemplateId);
          const key = `${patient.id}:${type.templateId}`;
          const known = baselines.get(key);
          let entries: DemoEntries | undefined = known?.entries;
          let prior: PriorExamInput | null = known?.prior ?? null;
          if (template && !known && (template.id === 'thyroid' || template.id === 'abdomen') && faker.datatype.boolean(0.45)) {
            entries = demoEntries(faker, template, { partial: status === 'in-progress' });
            // Now and then an aneurysm at the repair threshold, for the urgent-communication prompt.
            if (template.id === 'abdomen' && faker.datatype.boolean(0.3)) entries.measurements.aortaDiameterCm = faker.number.float({ min: 5.2, max: 5.9, fractionDigits: 1 });
            for (const years of faker.helpers.arrayElement([[1], [2, 1]])) {
              const at = new Date(start.getTime() - (years * 365 + faker.number.int({ min: -20, max: 20 })) * 86_400_000);
              const priorDay = zonedDate(at, CLINIC.timeZone);
              const k = (counters.get(priorDay) ?? 0) + 1;
              counters.set(priorDay, k);
              await raiseTo(`accession:${priorDay}`, k, transaction);
              const earlier = await Exam.create(examRow(at, 'completed', accessionFrom(priorDay, k), new Date(at.getTime() - 10 * 86_400_000)), { transaction });
              prior = await seedReport(
                faker,
                { exam: earlier, patient, templateId: type.templateId, timeZone: CLINIC.timeZone, sonographerId: r.sonographer.id, entries: earlierEntries(faker, template, entries, years), prior, signer: w.reader },
                transaction,
              );
            }
          }
          if (template && !entries && status === 'completed') entries = demoEntries(faker, template, { partial: false });
          if (entries && !known) baselines.set(key, { entries, prior });
          // Most reports of two and three days ago are signed (turnaround for the dashboard); the
          // rest, and everything since, wait in the reading queue.
          const signed = status === 'completed' && offset <= -2 && n % 10 < 7;
          await seedReport(
            faker,
            { exam, patient, templateId: type.templateId, timeZone: CLINIC.timeZone, sonographerId: r.sonographer.id, entries, prior, ...(signed ? { signer: w.reader, signAfterHours: 3 + (n % 20) } : {}) },
            transaction,
          );
        }
        // Leave a gap now and then, so the schedule shows free time.
        minute += type.durationMinutes + (faker.datatype.boolean(0.3) ? 15 * faker.number.int({ min: 1, max: 4 }) : 0);
      }
    }
  }
}

/** A self-pay exam paid in full with a test card: deposit at booking, balance after the scan. */
async function seedPaidInFull(exam: Exam, type: ExamType, transaction: Transaction): Promise<void> {
  await exam.update({ payer: 'self-pay', depositCents: type.depositCents, paymentState: 'paid' }, { transaction, silent: true });
  // Stable keys and intent ids from the accession number (the provider never saw these demo payments).
  const key = (kind: string) => createHash('sha256').update(`demo:${exam.accessionNumber}:${kind}`).digest('hex').slice(0, 32);
  const paid = (kind: 'deposit' | 'balance', amountCents: number, at: Date) => ({
    examId: exam.id,
    kind,
    amountCents,
    currency: exam.currency,
    status: 'succeeded' as const,
    idempotencyKey: key(kind),
    paymentMethod: 'pm_card_visa',
    providerIntentId: `pi_demo_${key(kind).slice(0, 24)}`,
    providerRefundId: null,
    refundOfId: null,
    failureCode: null,
    failureMessage: null,
    createdBy: null,
    createdAt: at,
    updatedAt: at,
  });
  await Payment.bulkCreate(
    [
      paid('deposit', type.depositCents, new Date(exam.createdAt.getTime() + 3 * 60_000)),
      paid('balance', exam.priceCents - type.depositCents, new Date(exam.scheduledEnd.getTime() + 10 * 60_000)),
    ],
    { transaction },
  );
}

function statusFor(faker: Faker, start: Date, minutes: number, now: Date): ExamStatus {
  const end = new Date(start.getTime() + minutes * 60_000);
  if (start > now) return faker.datatype.boolean(0.05) ? 'cancelled' : 'booked';
  if (end > now) return 'in-progress';
  const roll = faker.number.int({ min: 1, max: 100 });
  if (roll <= 6) return 'noshow';
  if (roll <= 10) return 'cancelled';
  return 'completed';
}
