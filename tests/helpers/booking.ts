import { ExamType, Room, Scanner, User } from '../../src/db/models';
import { addDays, zonedDate, zonedTimeToUtc } from '../../src/lib/time';
import { CLINIC } from '../../seeders/demo-clinic-data';
import { call, sessionFor } from './http';

export const TZ = CLINIC.timeZone;

/**
 * A Monday–Friday date well after the demo week, different for each `n`, so tests book
 * into empty days and never into each other's.
 */
export function testDay(n: number): string {
  let day = addDays(zonedDate(new Date(), TZ), 40 + n * 3);
  while ([0, 6].includes(new Date(`${day}T12:00:00Z`).getUTCDay())) day = addDays(day, 1);
  return day;
}

/** A clinic wall-clock time as an ISO instant. */
export const at = (day: string, hh: number, mm = 0) => zonedTimeToUtc(day, hh, mm, TZ).toISOString();

export interface Catalog {
  rooms: Array<{ id: number; name: string; scannerId: number; sonographerId: number }>;
  types: Record<string, { id: number; durationMinutes: number; depositCents: number; preparationText: string; name: string }>;
}

/** Rooms with their scanner and a sonographer each, and exam types by code. */
export async function catalog(): Promise<Catalog> {
  const [rooms, scanners, sonographers, types] = await Promise.all([
    Room.findAll({ order: [['id', 'ASC']] }),
    Scanner.findAll({ order: [['id', 'ASC']] }),
    User.findAll({ where: { role: 'sonographer', active: true }, order: [['id', 'ASC']] }),
    ExamType.findAll(),
  ]);
  return {
    rooms: rooms.map((r, i) => ({ id: r.id, name: r.name, scannerId: scanners.find((s) => s.roomId === r.id)!.id, sonographerId: sonographers[i % sonographers.length]!.id })),
    types: Object.fromEntries(types.map((t) => [t.code, { id: t.id, durationMinutes: t.durationMinutes, depositCents: t.depositCents, preparationText: t.preparationText, name: t.name }])),
  };
}

/** POSTs a booking as the front desk. */
export async function book(body: Record<string, unknown>) {
  return call('POST', '/api/exams', { cookie: await sessionFor('frontdesk'), json: body });
}

/** A booking body for room `roomIndex` at `start`, for a patient id. */
export function bookingBody(c: Catalog, opts: { patientId: number; start: string; roomIndex?: number; type?: string; payer?: 'self-pay' | 'insured' }) {
  const room = c.rooms[opts.roomIndex ?? 0]!;
  return {
    patientId: opts.patientId,
    examTypeId: c.types[opts.type ?? 'abdomen-complete']!.id,
    referrerId: null,
    indication: 'Right upper quadrant pain',
    priority: 'routine',
    payer: opts.payer ?? 'self-pay',
    roomId: room.id,
    scannerId: room.scannerId,
    sonographerId: room.sonographerId,
    start: opts.start,
  };
}
