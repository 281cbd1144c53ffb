import { describe, expect, it } from 'vitest';
import { freeGaps } from '../../src/lib/booking/gaps';
import { formatMoney, refundOnCancel } from '../../src/lib/booking/refunds';
import { freeSlots, openSpans, overlaps, withinOpenHours } from '../../src/lib/booking/slots';
import { DEFAULT_CLINIC_HOURS } from '../../src/lib/schemas/settings';
import { zonedClock, zonedTimeToUtc } from '../../src/lib/time';
import { paymentStateOf } from '../../src/server/payments/ledger';

const TZ = 'America/Chicago';
const t = (day: string, h: number, m = 0) => zonedTimeToUtc(day, h, m, TZ);
const WED = '2026-12-09';
const SAT = '2026-12-12';
const SUN = '2026-12-13';

describe('overlaps', () => {
  it('treats back-to-back spans as free and any shared minute as a clash', () => {
    const a = { start: t(WED, 9), end: t(WED, 9, 45) };
    expect(overlaps(a, { start: t(WED, 9, 45), end: t(WED, 10) })).toBe(false);
    expect(overlaps(a, { start: t(WED, 9, 44), end: t(WED, 10) })).toBe(true);
    expect(overlaps(a, { start: t(WED, 8), end: t(WED, 11) })).toBe(true);
  });
});

describe('opening hours', () => {
  it('opens 08:00–17:00 on weekdays, 08:00–12:00 on Saturday, not on Sunday (the demo default)', () => {
    expect(openSpans(WED, DEFAULT_CLINIC_HOURS, TZ).map((s) => [zonedClock(s.start, TZ), zonedClock(s.end, TZ)])).toEqual([['08:00', '17:00']]);
    expect(openSpans(SAT, DEFAULT_CLINIC_HOURS, TZ).map((s) => zonedClock(s.end, TZ))).toEqual(['12:00']);
    expect(openSpans(SUN, DEFAULT_CLINIC_HOURS, TZ)).toEqual([]);
    expect(openSpans(WED, { ...DEFAULT_CLINIC_HOURS, closedDates: [WED] }, TZ)).toEqual([]);
  });
  it('wants the whole exam inside opening hours', () => {
    expect(withinOpenHours({ start: t(WED, 16, 15), end: t(WED, 17) }, DEFAULT_CLINIC_HOURS, TZ)).toBe(true);
    expect(withinOpenHours({ start: t(WED, 16, 30), end: t(WED, 17, 15) }, DEFAULT_CLINIC_HOURS, TZ)).toBe(false);
    expect(withinOpenHours({ start: t(WED, 7, 45), end: t(WED, 8, 30) }, DEFAULT_CLINIC_HOURS, TZ)).toBe(false);
  });
});

describe('freeSlots', () => {
  const base = { hours: DEFAULT_CLINIC_HOURS, timeZone: TZ, durationMinutes: 45, now: t('2026-12-01', 12) };
  it('skips starts that would overlap a busy span and stops where the exam would pass closing', () => {
    const slots = freeSlots({ ...base, fromDay: WED, days: 1, busy: [{ start: t(WED, 8), end: t(WED, 8, 45) }], limit: 100 }).map((d) => zonedClock(d, TZ));
    expect(slots[0]).toBe('08:45');
    expect(slots).not.toContain('08:30');
    expect(slots[slots.length - 1]).toBe('16:15');
  });
  it('never offers a time in the past, and moves on to the next open day', () => {
    const now = t(WED, 16, 20);
    const slots = freeSlots({ ...base, now, fromDay: WED, days: 3, busy: [], limit: 2 });
    expect(slots.map((d) => d.toISOString())).toEqual([t('2026-12-10', 8).toISOString(), t('2026-12-10', 8, 15).toISOString()]);
  });
});

describe('freeGaps', () => {
  it('lists the free stretches between bookings, ignoring slivers shorter than the minimum', () => {
    const open = [{ start: t(WED, 8), end: t(WED, 12) }];
    const taken = [{ start: t(WED, 9), end: t(WED, 10) }, { start: t(WED, 10, 10), end: t(WED, 11) }];
    expect(freeGaps(open, taken, 15).map((g) => `${zonedClock(g.start, TZ)}–${zonedClock(g.end, TZ)}`)).toEqual(['08:00–09:00', '11:00–12:00']);
  });
});

describe('refundOnCancel (clinic policy: full refund 24 hours or more ahead, else the deposit is kept)', () => {
  const policy = { fullRefundHoursAhead: 24 };
  it('refunds everything at exactly 24 hours, keeps the deposit just under', () => {
    expect(refundOnCancel({ policy, hoursAhead: 24, depositPaidCents: 7500, balancePaidCents: 0 })).toMatchObject({ refundCents: 7500, keptCents: 0 });
    expect(refundOnCancel({ policy, hoursAhead: 23.99, depositPaidCents: 7500, balancePaidCents: 0 })).toMatchObject({ refundCents: 0, keptCents: 7500 });
  });
  it('always returns a balance paid in advance, even late', () => {
    expect(refundOnCancel({ policy, hoursAhead: 2, depositPaidCents: 7500, balancePaidCents: 18500 })).toMatchObject({ refundCents: 18500, keptCents: 7500 });
  });
  it('formats integer cents with the currency', () => {
    expect(formatMoney(7500, 'USD')).toBe('$75.00');
    expect(formatMoney(26000, 'USD')).toBe('$260.00');
  });
});

describe('paymentStateOf', () => {
  const exam = { payer: 'self-pay' as const, status: 'booked' as const, priceCents: 26000, depositCents: 7500 };
  const none = { depositPaidCents: 0, balancePaidCents: 0, refundedCents: 0, refundPendingCents: 0 };
  it('follows the ledger of a self-pay exam', () => {
    expect(paymentStateOf(exam, none)).toBe('deposit-due');
    expect(paymentStateOf(exam, { ...none, depositPaidCents: 7500 })).toBe('deposit-paid');
    expect(paymentStateOf({ ...exam, status: 'completed' }, { ...none, depositPaidCents: 7500, balancePaidCents: 18500 })).toBe('paid');
    expect(paymentStateOf({ ...exam, status: 'cancelled' }, { ...none, depositPaidCents: 7500, refundPendingCents: 7500 })).toBe('refund-due');
    expect(paymentStateOf({ ...exam, status: 'cancelled' }, { ...none, depositPaidCents: 7500, refundedCents: 7500 })).toBe('refunded');
    expect(paymentStateOf({ ...exam, status: 'noshow' }, { ...none, depositPaidCents: 7500 })).toBe('deposit-kept');
  });
  it('shows nothing for exams billed to an insurer', () => {
    expect(paymentStateOf({ ...exam, payer: 'insured' }, none)).toBe('none');
  });
});
