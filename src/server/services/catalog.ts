import { ExamType, Room, Scanner, User } from '../../db/models';

export interface BookingCatalog {
  examTypes: Array<{ id: number; name: string; durationMinutes: number; selfPayPriceCents: number; depositCents: number; currency: string; probeKind: string }>;
  rooms: Array<{ id: number; name: string }>;
  scanners: Array<{ id: number; name: string; roomId: number; aeTitle: string }>;
  sonographers: Array<{ id: number; name: string }>;
}

/** What a booking can be made against: active exam types, rooms, scanners and sonographers. */
export async function bookingCatalog(): Promise<BookingCatalog> {
  const [types, rooms, scanners, sonographers] = await Promise.all([
    ExamType.findAll({ where: { active: true }, order: [['name', 'ASC']] }),
    Room.findAll({ where: { active: true }, order: [['name', 'ASC']] }),
    Scanner.findAll({ where: { active: true }, order: [['name', 'ASC']] }),
    User.findAll({ where: { role: 'sonographer', active: true }, order: [['displayName', 'ASC']] }),
  ]);
  return {
    examTypes: types.map((t) => ({
      id: t.id,
      name: t.name,
      durationMinutes: t.durationMinutes,
      selfPayPriceCents: t.selfPayPriceCents,
      depositCents: t.depositCents,
      currency: t.currency,
      probeKind: t.probeKind,
    })),
    rooms: rooms.map((r) => ({ id: r.id, name: r.name })),
    scanners: scanners.map((s) => ({ id: s.id, name: s.name, roomId: s.roomId, aeTitle: s.aeTitle })),
    sonographers: sonographers.map((u) => ({ id: u.id, name: u.displayName })),
  };
}
