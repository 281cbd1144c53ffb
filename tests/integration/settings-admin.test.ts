import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { Op } from 'sequelize';
import { AuditEvent, Patient, Report, Setting, User } from '../../src/db/models';
import { canonicalJson } from '../../src/lib/canonical-json';
import { URGENT_RULES } from '../../src/lib/clinical/urgent';
import { DEMO_LOGIN } from '../helpers/demo';
import type { ClinicSettingsDto, SettingsGroup } from '../../src/lib/schemas/settings';
import type { StoredEvaluation } from '../../src/lib/schemas/reports';
import { at, book, bookingBody, catalog, testDay } from '../helpers/booking';
import { closeTestDb, testDb } from '../helpers/db';
import { call, sessionFor } from '../helpers/http';

// The clinic settings form's API: every save audited, stale saves refused, bad input named by
// field, and the settings taking effect (closed days, urgent prompts). Other integration files
// share this database and app, so every test puts back what it changed (through the API, which
// also clears the app's settings cache), and rows that did not exist at the start are removed.
const GROUPS: SettingsGroup[] = ['clinic', 'hours', 'cancellations', 'delivery', 'urgentRules'];
const PATH: Record<SettingsGroup, string> = { clinic: 'clinic', hours: 'hours', cancellations: 'cancellations', delivery: 'delivery', urgentRules: 'urgent-rules' };
const KEY: Record<SettingsGroup, string> = { clinic: 'clinic', hours: 'clinic.hours', cancellations: 'payments.policy', delivery: 'reports.delivery', urgentRules: 'reports.urgentRules' };
/** The body a group's PUT takes for a stored value (the profile's currency is not edited). */
const BODY: Record<SettingsGroup, (value: any) => Record<string, unknown>> = {
  clinic: ({ currency: _currency, ...profile }) => profile,
  hours: (v) => v,
  cancellations: (v) => v,
  delivery: (v) => v,
  urgentRules: (v) => ({ rules: v }),
};

let admin: string;
let start: ClinicSettingsDto;

const read = async (cookie = admin): Promise<ClinicSettingsDto> => {
  const res = await call('GET', '/api/admin/settings', { cookie });
  expect(res.status).toBe(200);
  return res.body.settings;
};
const put = (group: SettingsGroup, json: unknown, cookie = admin) => call('PUT', `/api/admin/settings/${PATH[group]}`, { cookie, json });
/** Saves a group with the version now stored, from its current value changed by `change`. */
async function change<G extends SettingsGroup>(group: G, edit: (value: ClinicSettingsDto[G]['value']) => ClinicSettingsDto[G]['value']) {
  const now = (await read())[group];
  const res = await put(group, { ...BODY[group](edit(structuredClone(now.value))), version: now.version });
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return res.body.setting;
}
const lastAudit = (group: SettingsGroup) => AuditEvent.findOne({ where: { action: 'settings.change', entityId: KEY[group] }, order: [['id', 'DESC']] });
const auditCount = () => AuditEvent.count({ where: { action: 'settings.change' } });

beforeAll(async () => {
  testDb();
  admin = await sessionFor('admin');
  start = await read();
});

afterEach(async () => {
  const now = await read();
  for (const g of GROUPS) {
    if (canonicalJson(now[g].value) === canonicalJson(start[g].value)) continue;
    const res = await put(g, { ...BODY[g](start[g].value), version: now[g].version });
    expect(res.status, `restoring ${g}`).toBe(200);
  }
});

afterAll(async () => {
  // A row this file created holds the default it replaced, so the app reads the same after it goes.
  for (const g of GROUPS) if (start[g].updatedAt === null) await Setting.destroy({ where: { key: KEY[g] } });
  await closeTestDb();
});

describe('reading the settings', () => {
  it('gives every group with its value and a version', async () => {
    const s = await read();
    expect(s.clinic.value.timeZone).toBe('America/Chicago');
    expect(s.hours.value.weekly).toHaveLength(7);
    expect(s.cancellations.value.fullRefundHoursAhead).toBeGreaterThanOrEqual(0);
    expect(typeof s.delivery.value.attachPdf).toBe('boolean');
    // Every rule of urgent.ts, each on until the clinic switches it off.
    expect(Object.keys(s.urgentRules.value).sort()).toEqual(Object.keys(URGENT_RULES).sort());
    for (const g of GROUPS) expect(s[g].version, g).toMatch(/\S/);
  });

  it('is for the clinic manager only: 401 signed out, 403 for every other role, reading or saving', async () => {
    expect((await call('GET', '/api/admin/settings')).status).toBe(401);
    for (const role of ['frontdesk', 'sonographer', 'radiologist', 'referrer'] as const) {
      const cookie = await sessionFor(role);
      const get = await call('GET', '/api/admin/settings', { cookie });
      expect(get.status, role).toBe(403);
      expect(get.body.error.code).toBe('FORBIDDEN');
      const save = await put('delivery', { version: start.delivery.version, linkDays: 3, attachPdf: true }, cookie);
      expect(save.status, role).toBe(403);
    }
    expect((await read()).delivery.value).toEqual(start.delivery.value);
    expect((await call('GET', '/admin/settings', { cookie: await sessionFor('frontdesk') })).status).toBe(403);
  });
});

describe('saving a group', () => {
  it('writes one audit event per save naming the key and the changed fields with old and new values', async () => {
    const adminId = (await User.findOne({ where: { email: DEMO_LOGIN.admin } }))!.id;
    const closed = testDay(140);

    await change('clinic', (v) => ({ ...v, phone: '+1 555 0100 399', timeZone: 'America/Denver' }));
    const clinic = (await lastAudit('clinic'))!;
    expect(clinic.actorUserId).toBe(adminId);
    expect(clinic.requestId).toMatch(/\S/);
    expect(clinic.detail).toMatchObject({
      keys: ['clinic'],
      changes: { phone: { from: start.clinic.value.phone, to: '+1 555 0100 399' }, timeZone: { from: 'America/Chicago', to: 'America/Denver' } },
    });
    expect((clinic.detail!.fields as string[]).sort()).toEqual(['phone', 'timeZone']);
    // The currency is not part of the form and stays as it was.
    expect((await read()).clinic.value.currency).toBe(start.clinic.value.currency);

    await change('hours', (v) => ({ weekly: v.weekly.map((day, i) => (i === 1 ? [{ open: '08:00', close: '12:00' }, { open: '13:00', close: '17:00' }] : day)), closedDates: [...v.closedDates, closed] }));
    const hours = (await lastAudit('hours'))!;
    expect((hours.detail!.fields as string[]).sort()).toEqual(['closedDates', 'weekly.1']);
    expect(hours.detail).toMatchObject({ keys: ['clinic.hours'], changes: { closedDates: { added: [closed], removed: [] }, 'weekly.1': { from: start.hours.value.weekly[1], to: [{ open: '08:00', close: '12:00' }, { open: '13:00', close: '17:00' }] } } });

    const hoursAhead = start.cancellations.value.fullRefundHoursAhead + 24;
    await change('cancellations', () => ({ fullRefundHoursAhead: hoursAhead }));
    expect((await lastAudit('cancellations'))!.detail).toEqual({
      keys: ['payments.policy'],
      fields: ['fullRefundHoursAhead'],
      changes: { fullRefundHoursAhead: { from: start.cancellations.value.fullRefundHoursAhead, to: hoursAhead } },
    });

    await change('delivery', (v) => ({ linkDays: 14, attachPdf: !v.attachPdf }));
    expect((await lastAudit('delivery'))!.detail).toMatchObject({
      keys: ['reports.delivery'],
      changes: { linkDays: { from: start.delivery.value.linkDays, to: 14 }, attachPdf: { from: start.delivery.value.attachPdf, to: !start.delivery.value.attachPdf } },
    });

    await change('urgentRules', (v) => ({ ...v, 'lvef-severe': false }));
    expect((await lastAudit('urgentRules'))!.detail).toEqual({ keys: ['reports.urgentRules'], fields: ['lvef-severe'], changes: { 'lvef-severe': { from: true, to: false } } });

    // Read back as saved; a save that changes nothing records nothing.
    const after = await read();
    expect(after.clinic.value.timeZone).toBe('America/Denver');
    expect(after.hours.value.closedDates).toContain(closed);
    expect(after.urgentRules.value['lvef-severe']).toBe(false);
    const before = await auditCount();
    expect((await put('cancellations', { fullRefundHoursAhead: hoursAhead, version: after.cancellations.version })).status).toBe(200);
    expect(await auditCount()).toBe(before);
  });

  it('refuses a save against a version someone else has replaced (409) and keeps their value', async () => {
    const seen = (await read()).cancellations;
    const mine = await put('cancellations', { fullRefundHoursAhead: 48, version: seen.version });
    expect(mine.status).toBe(200);
    expect(mine.body.setting.version).not.toBe(seen.version);
    const theirs = await put('cancellations', { fullRefundHoursAhead: 72, version: seen.version });
    expect(theirs.status).toBe(409);
    expect(theirs.body.error.code).toBe('STALE');
    expect(theirs.body.error.current.value).toEqual({ fullRefundHoursAhead: 48 });
    expect((await read()).cancellations.value.fullRefundHoursAhead).toBe(48);

    // Two saves of the same version at once: one wins, the other is told.
    const now = (await read()).delivery;
    const both = await Promise.all([
      put('delivery', { version: now.version, linkDays: 7, attachPdf: now.value.attachPdf }),
      put('delivery', { version: now.version, linkDays: 9, attachPdf: now.value.attachPdf }),
    ]);
    expect(both.map((r) => r.status).sort()).toEqual([200, 409]);
    const winner = both.find((r) => r.status === 200)!.body.setting.value.linkDays;
    expect((await read()).delivery.value.linkDays).toBe(winner);
  });

  it('answers bad input with 400 naming each field, and saves nothing', async () => {
    const s = await read();
    const before = await auditCount();
    const { currency: _c, ...profile } = s.clinic.value;
    const expectFields = async (group: SettingsGroup, json: unknown, fields: string[]) => {
      const res = await put(group, json);
      expect(res.status, JSON.stringify(json)).toBe(400);
      expect(res.body.error.code).toBe('VALIDATION');
      for (const f of fields) expect(res.body.error.fields, `${f} in ${JSON.stringify(res.body.error.fields)}`).toHaveProperty([f]);
    };
    const clinic = { ...profile, version: s.clinic.version };
    // Not IANA zones: an invented one, an offset, an abbreviation Intl does not know.
    for (const timeZone of ['Mars/Olympus', '+01:00', 'CEST', '']) await expectFields('clinic', { ...clinic, timeZone }, ['timeZone']);
    await expectFields('clinic', { ...clinic, name: ' ', email: 'not an address' }, ['name', 'email']);

    const week = s.hours.value.weekly;
    const withMonday = (monday: unknown) => ({ version: s.hours.version, closedDates: [], weekly: week.map((d, i) => (i === 1 ? monday : d)) });
    await expectFields('hours', withMonday([{ open: '12:00', close: '09:00' }]), ['weekly.1.0.close']);
    await expectFields('hours', withMonday([{ open: '08:00', close: '12:00' }, { open: '11:30', close: '15:00' }]), ['weekly.1.1.open']);
    await expectFields('hours', withMonday([{ open: '8:00', close: '25:00' }]), ['weekly.1.0.open', 'weekly.1.0.close']);
    await expectFields('hours', withMonday(Array.from({ length: 4 }, (_, i) => ({ open: `0${i + 1}:00`, close: `0${i + 1}:30` }))), ['weekly.1']);
    await expectFields('hours', { version: s.hours.version, closedDates: [], weekly: week.slice(0, 6) }, ['weekly']);
    await expectFields('hours', { version: s.hours.version, weekly: week, closedDates: ['2031-02-30', '2031-13-01', '31/12/2031'] }, ['closedDates.0', 'closedDates.1', 'closedDates.2']);
    await expectFields('hours', { version: s.hours.version, weekly: week, closedDates: ['2031-12-24', '2031-12-24'] }, ['closedDates.1']);

    await expectFields('cancellations', { version: s.cancellations.version, fullRefundHoursAhead: -1 }, ['fullRefundHoursAhead']);
    await expectFields('cancellations', { version: s.cancellations.version, fullRefundHoursAhead: 1.5 }, ['fullRefundHoursAhead']);
    await expectFields('cancellations', { fullRefundHoursAhead: 12 }, ['version']);
    await expectFields('delivery', { version: s.delivery.version, linkDays: 0, attachPdf: 'yes' }, ['linkDays', 'attachPdf']);
    await expectFields('urgentRules', { version: s.urgentRules.version, rules: { ...s.urgentRules.value, 'lvef-severe': 'off' } }, ['rules.lvef-severe']);
    const { 'lvef-severe': _dropped, ...missingOne } = s.urgentRules.value;
    await expectFields('urgentRules', { version: s.urgentRules.version, rules: missingOne }, ['rules.lvef-severe']);
    expect((await put('urgentRules', { version: s.urgentRules.version, rules: { ...s.urgentRules.value, 'no-such-rule': false } })).status).toBe(400);

    expect(await auditCount()).toBe(before);
    expect(await read()).toEqual(s);
  });
});

describe('the settings take effect', () => {
  it('a closed date offers no booking slots (and says how many exams are still booked on it)', async () => {
    const c = await catalog();
    const room = c.rooms[0]!;
    const day = testDay(135);
    const slots = async () => {
      const res = await call('GET', `/api/slots?examTypeId=${c.types['abdomen-complete']!.id}&roomId=${room.id}&scannerId=${room.scannerId}&sonographerId=${room.sonographerId}&from=${day}`, { cookie: admin });
      expect(res.status).toBe(200);
      return res.body.slots as Array<{ day: string; time: string }>;
    };
    // An open weekday with nothing booked: the first free time is on that day.
    expect((await slots())[0]!.day).toBe(day);
    const patient = (await Patient.findOne({ order: [['id', 'DESC']] }))!;
    const booked = await book(bookingBody(c, { patientId: patient.id, start: at(day, 15, 0), roomIndex: 1, payer: 'insured' }));
    expect(booked.status).toBe(201);

    const now = (await read()).hours;
    const res = await put('hours', { ...now.value, closedDates: [...now.value.closedDates, day], version: now.version });
    expect(res.status).toBe(200);
    // The exam booked that day stays booked; the answer counts it for the manager.
    expect(res.body.bookedOnClosedDates).toEqual([{ date: day, exams: 1 }]);
    const after = await slots();
    expect(after.length).toBeGreaterThan(0);
    expect(after.filter((s) => s.day === day)).toEqual([]);
    expect(after[0]!.day > day).toBe(true);
    const exam = await call('GET', `/api/exams/${booked.body.exam.id}`, { cookie: admin });
    expect(exam.body.exam).toMatchObject({ status: 'booked', start: at(day, 15, 0) });
    // Cancel the test's own booking so the day is empty again for anyone after us.
    expect((await call('POST', `/api/exams/${booked.body.exam.id}/cancel`, { cookie: await sessionFor('frontdesk'), json: { version: exam.body.exam.version, reason: 'Settings test booking' } })).status).toBe(200);
  });

  it('a switched-off urgent rule gives the reading physician no prompt; switching it on again changes no stored report', async () => {
    const reader = await sessionFor('radiologist');
    const sonographer = await sessionFor('sonographer');
    const RULE = 'aaa-repair-threshold';
    const PROMPT_TEXT = URGENT_RULES[RULE].description.slice(0, 40);
    const setRule = async (on: boolean) => change('urgentRules', (v) => ({ ...v, [RULE]: on }));
    await setRule(false);

    // A fresh abdomen exam of this file's own day, scanned with an aorta of 5.8 cm and submitted.
    const c = await catalog();
    const patient = (await Patient.findOne({ order: [['id', 'ASC']] }))!;
    const booked = await book(bookingBody(c, { patientId: patient.id, start: at(testDay(130), 9, 0), payer: 'insured', type: 'abdomen-complete' }));
    expect(booked.status).toBe(201);
    const examId = booked.body.exam.id;
    expect((await call('POST', `/api/exams/${examId}/status`, { cookie: await sessionFor('frontdesk'), json: { version: 0, to: 'arrived' } })).status).toBe(200);
    const started = await call('POST', `/api/exams/${examId}/start`, { cookie: sonographer, json: { version: 1 } });
    expect(started.status).toBe(200);
    const reportId: number = started.body.reportId;
    const model = (await Report.findOne({ where: { templateId: 'abdomen', status: { [Op.in]: ['preliminary', 'final'] } }, order: [['id', 'ASC']] }))!;
    const entries = { measurements: { ...model.measurements, aortaDiameterCm: 5.8 }, nodules: [], heightCm: null, weightKg: null, probeId: null };
    const draft = await call('PUT', `/api/reports/${reportId}/draft`, { cookie: sonographer, json: { version: 0, ...entries } });
    expect(draft.status, JSON.stringify(draft.body)).toBe(200);
    const submitted = await call('POST', `/api/reports/${reportId}/submit`, { cookie: sonographer, json: { version: draft.body.report.version } });
    expect(submitted.status, JSON.stringify(submitted.body)).toBe(200);

    const seen = async () => {
      const res = await call('GET', `/api/reports/${reportId}`, { cookie: reader });
      expect(res.status).toBe(200);
      const page = await call('GET', `/exams/${examId}/report`, { cookie: reader });
      expect(page.status).toBe(200);
      return { evaluation: res.body.report.evaluation as StoredEvaluation, page: page.body as string };
    };
    const stored = async () => ((await Report.findByPk(reportId))!.evaluation as StoredEvaluation).urgentPrompts.map((p) => p.ruleId);

    // Off: still an aneurysm, flagged high (≥ 3.0 cm, common practice; CLINICAL.md §2), but no prompt
    // in the API answer or on the reading page; the stored evaluation records which rules were off.
    let view = await seen();
    expect(view.evaluation.flags.find((f) => f.valueCode === 'aortaDiameterCm')!.status).toBe('high');
    expect(view.evaluation.urgentPrompts.map((p) => p.ruleId)).not.toContain(RULE);
    expect(view.evaluation.options.disabledUrgentRules).toContain(RULE);
    expect(view.page).not.toContain(PROMPT_TEXT);
    expect(await stored()).not.toContain(RULE);

    // On again: the report evaluated while it was off is not rewritten…
    await setRule(true);
    expect((await seen()).evaluation.urgentPrompts.map((p) => p.ruleId)).not.toContain(RULE);
    // …until the physician's correction evaluates it again, now with the prompt
    // (5.8 cm is at the repair threshold for men and women, SVS/ESVS, SRC~).
    const version = (await Report.findByPk(reportId))!.version;
    expect((await call('PUT', `/api/reports/${reportId}/draft`, { cookie: reader, json: { version, ...entries } })).status).toBe(200);
    view = await seen();
    expect(view.evaluation.urgentPrompts.map((p) => p.ruleId)).toContain(RULE);
    expect(view.page).toContain(PROMPT_TEXT);

    // Off once more: a report still being read no longer shows the stored prompt, which stays stored.
    await setRule(false);
    view = await seen();
    expect(view.evaluation.urgentPrompts.map((p) => p.ruleId)).not.toContain(RULE);
    expect(view.page).not.toContain(PROMPT_TEXT);
    expect(await stored()).toContain(RULE);
  });
});
