import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Op } from 'sequelize';
import { AuditEvent, Exam, Patient } from '../../src/db/models';
import { MRN_PATTERN } from '../../src/lib/identifiers';
import { listPatientExams } from '../../src/server/services/patients';
import { closeTestDb, testDb } from '../helpers/db';
import { call, sessionFor } from '../helpers/http';

beforeAll(() => {
  testDb();
});
afterAll(closeTestDb);

// Names may not hold digits, so each run spells its time stamp in letters ("Qbcdef…").
const letters = (n: number) => [...String(n)].map((d) => 'abcdefghij'[Number(d)]).join('');
const RUN = 'Q' + letters(Date.now());

const person = (n: number | string, extra: Record<string, unknown> = {}) => ({
  familyName: `Testfamily${RUN}`,
  givenName: `Given${typeof n === 'number' ? letters(n) : n}`,
  birthDate: '1975-06-30',
  sex: 'female',
  email: '',
  phone: '+1 555 0199 123',
  addressLine: '9 Lantern Walk',
  city: 'Marrow Bay',
  postalCode: '40311',
  ...extra,
});

const list = async (q: string, extra = '') =>
  call('GET', `/api/patients?q=${encodeURIComponent(q)}${extra}`, { cookie: await sessionFor('frontdesk') });

describe('patient search', () => {
  it('finds a patient by the start of given and family name, in any order and case', async () => {
    const p = (await Patient.findOne({ order: [['id', 'ASC']] }))!;
    const q = `${p.givenName.slice(0, 3).toLowerCase()} ${p.familyName.slice(0, 3).toUpperCase()}`;
    const res = await list(q);
    expect(res.status).toBe(200);
    expect(res.body.search).toEqual({ kind: 'name', words: q.split(' ') });
    expect(res.body.rows.map((r: { id: number }) => r.id)).toContain(p.id);
    for (const r of res.body.rows) {
      const names = [r.familyName.toLowerCase(), r.givenName.toLowerCase()];
      for (const w of q.toLowerCase().split(' ')) expect(names.some((n: string) => n.startsWith(w))).toBe(true);
    }
    // Every word must match: a second word that starts neither name finds nothing.
    expect((await list(`${p.familyName} Zzzqx`)).body.total).toBe(0);
    // "Family, Given" as written on a form works too.
    expect((await list(`${p.familyName}, ${p.givenName}`)).body.rows.map((r: { id: number }) => r.id)).toContain(p.id);
  });

  it('finds a patient by MRN, exactly and in any case', async () => {
    const p = (await Patient.findOne({ order: [['id', 'DESC']], where: { mrn: { [Op.like]: 'P%' } } }))!;
    const res = await list(p.mrn.toLowerCase());
    expect(res.body.search).toEqual({ kind: 'mrn', mrn: p.mrn });
    expect(res.body.rows).toEqual([expect.objectContaining({ id: p.id, mrn: p.mrn })]);
    expect((await list(p.mrn.slice(0, 7))).body.rows.map((r: { id: number }) => r.id)).not.toContain(p.id);
  });

  it('finds patients by birth date written as YYYY-MM-DD, DD/MM/YYYY or with the month named', async () => {
    const p = (await Patient.findOne({ order: [['id', 'ASC']], offset: 3 }))!;
    const [y, m, d] = p.birthDate.split('-');
    const month = new Intl.DateTimeFormat('en-GB', { month: 'short', timeZone: 'UTC' }).format(new Date(p.birthDate + 'T00:00:00Z'));
    for (const q of [p.birthDate, `${d}/${m}/${y}`, `${d}.${m}.${y}`, `${Number(d)} ${month} ${y}`]) {
      const res = await list(q);
      expect(res.body.search, q).toEqual({ kind: 'birthDate', birthDate: p.birthDate });
      expect(res.body.rows.map((r: { id: number }) => r.id), q).toContain(p.id);
      expect(res.body.rows.every((r: { birthDate: string }) => r.birthDate === p.birthDate)).toBe(true);
    }
  });

  it('answers a date that is not on the calendar with no rows and says why', async () => {
    const res = await list('31/02/1980');
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ rows: [], total: 0, search: { kind: 'invalidDate' } });
  });

  it('treats LIKE wildcards in the search text as plain characters', async () => {
    expect((await list('%')).body.total).toBe(0);
    expect((await list('_')).body.total).toBe(0);
    expect((await list('\\')).body.total).toBe(0);
  });

  it('pages and sorts on the server', async () => {
    const total = await Patient.count();
    const first = await list('', '&pageSize=5&page=1&sort=name&dir=asc');
    const second = await list('', '&pageSize=5&page=2&sort=name&dir=asc');
    expect(first.body.total).toBe(total);
    expect(first.body.rows).toHaveLength(5);
    const ids = new Set(first.body.rows.map((r: { id: number }) => r.id));
    expect(second.body.rows.some((r: { id: number }) => ids.has(r.id))).toBe(false);
    const initials = [...first.body.rows, ...second.body.rows].map((r: { familyName: string }) =>
      r.familyName.normalize('NFD').replace(/\p{M}/gu, '').charAt(0).toLowerCase(),
    );
    expect(initials).toEqual([...initials].sort());
    const all = (await list('', '&pageSize=100&sort=name&dir=asc')).body.rows.map((r: { id: number }) => r.id);
    const allDesc = (await list('', '&pageSize=100&sort=name&dir=desc')).body.rows.map((r: { id: number }) => r.id);
    if (total <= 100) expect(allDesc).toEqual([...all].reverse());
    const byBirth = await list('', '&pageSize=10&sort=birthDate&dir=desc');
    const dates = byBirth.body.rows.map((r: { birthDate: string }) => r.birthDate);
    expect(dates).toEqual([...dates].sort().reverse());
    expect((await list('', '&pageSize=101')).status).toBe(400);
    expect((await list('', '&sort=phone')).status).toBe(400);
  });

  it('lists summaries only: no contact details in search results', async () => {
    const res = await list('', '&pageSize=1');
    expect(Object.keys(res.body.rows[0]).sort()).toEqual(['birthDate', 'city', 'familyName', 'givenName', 'id', 'mrn', 'sex']);
  });
});

describe('creating patients', () => {
  it('gives a new MRN and audits the field names, never the values', async () => {
    const desk = await sessionFor('frontdesk');
    const highest = (await Patient.max('mrn')) as string;
    const body = person(1, { email: 'Given.One@Patients.TEST' });
    const res = await call('POST', '/api/patients', { cookie: desk, json: body });
    expect(res.status).toBe(201);
    const created = res.body.patient;
    expect(created.mrn).toMatch(MRN_PATTERN);
    expect(created).toMatchObject({ familyName: body.familyName, givenName: body.givenName, email: 'given.one@patients.test', version: 0 });
    expect(created.mrn > highest).toBe(true);

    const events = await AuditEvent.findAll({ where: { action: 'patient.create', entityId: String(created.id) } });
    expect(events).toHaveLength(1);
    expect(events[0]!.detail).toEqual({ fields: ['familyName', 'givenName', 'birthDate', 'sex', 'email', 'phone', 'addressLine', 'city', 'postalCode'] });
    const detail = JSON.stringify(events[0]!.detail);
    for (const value of [body.familyName, body.givenName, body.birthDate, 'given.one', body.phone, body.addressLine, body.city, body.postalCode, created.mrn]) {
      expect(detail).not.toContain(value);
    }
  });

  it('refuses bad input with 400 and a message per field', async () => {
    const res = await call('POST', '/api/patients', {
      cookie: await sessionFor('frontdesk'),
      json: person(2, { birthDate: '2999-01-01', sex: 'x', familyName: '' }),
    });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields).sort()).toEqual(['birthDate', 'familyName', 'sex']);
    expect(res.body.error.fields.birthDate).toContain('future');
  });

  it('refuses a likely duplicate with 409 and the candidates, then saves once confirmed', async () => {
    const desk = await sessionFor('frontdesk');
    const first = (await call('POST', '/api/patients', { cookie: desk, json: person(3) })).body.patient;
    const before = await Patient.count();

    // Same person, typed in another case: still a duplicate (the collation ignores case).
    const again = person(3, { familyName: person(3).familyName.toUpperCase(), givenName: person(3).givenName.toLowerCase() });
    const refused = await call('POST', '/api/patients', { cookie: desk, json: again });
    expect(refused.status).toBe(409);
    expect(refused.body.error.code).toBe('POSSIBLE_DUPLICATE');
    expect(refused.body.error.message).toMatch(/same name and birth date/);
    expect(refused.body.error.candidates).toEqual([
      { id: first.id, mrn: first.mrn, familyName: first.familyName, givenName: first.givenName, birthDate: first.birthDate },
    ]);
    expect(await Patient.count()).toBe(before);

    const confirmed = await call('POST', '/api/patients', { cookie: desk, json: { ...again, confirmedNotDuplicate: true } });
    expect(confirmed.status).toBe(201);
    expect(confirmed.body.patient.mrn).not.toBe(first.mrn);
    const event = await AuditEvent.findOne({ where: { action: 'patient.create', entityId: String(confirmed.body.patient.id) } });
    expect(event!.detail).toMatchObject({ confirmedNotDuplicate: true });
  });

  it('does not count a different birth date as a duplicate', async () => {
    const desk = await sessionFor('frontdesk');
    expect((await call('POST', '/api/patients', { cookie: desk, json: person(4) })).status).toBe(201);
    expect((await call('POST', '/api/patients', { cookie: desk, json: person(4, { birthDate: '1975-07-01' }) })).status).toBe(201);
  });

  it('the duplicates endpoint finds records regardless of case and accents, or by MRN', async () => {
    const desk = await sessionFor('frontdesk');
    const zoe = (await call('POST', '/api/patients', { cookie: desk, json: person('Zoë', { familyName: `Åberg${RUN}` }) })).body.patient;
    const qs = new URLSearchParams({ familyName: `aberg${RUN}`.toUpperCase(), givenName: 'givenzoe', birthDate: '1975-06-30' });
    const found = await call('GET', `/api/patients/duplicates?${qs}`, { cookie: desk });
    expect(found.status).toBe(200);
    expect(found.body.candidates.map((c: { id: number }) => c.id)).toEqual([zoe.id]);
    qs.set('excludeId', String(zoe.id));
    expect((await call('GET', `/api/patients/duplicates?${qs}`, { cookie: desk })).body.candidates).toEqual([]);
    const byMrn = await call('GET', `/api/patients/duplicates?mrn=${zoe.mrn.toLowerCase()}`, { cookie: desk });
    expect(byMrn.body.candidates.map((c: { id: number }) => c.id)).toEqual([zoe.id]);
    const bad = await call('GET', '/api/patients/duplicates?familyName=X', { cookie: desk });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields).toHaveProperty('birthDate');
  });

  it('twenty creates at once get twenty distinct MRNs', async () => {
    const desk = await sessionFor('frontdesk');
    const results = await Promise.all(
      Array.from({ length: 20 }, (_, i) => call('POST', '/api/patients', { cookie: desk, json: person(100 + i) })),
    );
    expect(results.map((r) => r.status)).toEqual(Array(20).fill(201));
    const mrns = results.map((r) => r.body.patient.mrn as string);
    expect(new Set(mrns).size).toBe(20);
    for (const mrn of mrns) expect(mrn).toMatch(MRN_PATTERN);
    expect(await Patient.count({ where: { mrn: mrns } })).toBe(20);
  });

  it('the same person registered at two desks at once gets one record and one duplicate warning', async () => {
    const desk = await sessionFor('frontdesk');
    const admin = await sessionFor('admin');
    const results = await Promise.all([desk, admin, desk, admin].map((cookie) => call('POST', '/api/patients', { cookie, json: person(200) })));
    expect(results.map((r) => r.status).sort()).toEqual([201, 409, 409, 409]);
    expect(await Patient.count({ where: { givenName: person(200).givenName, familyName: person(200).familyName } })).toBe(1);
  });
});

describe('editing patients', () => {
  it('saves a change with the version seen, refuses a stale version and keeps the row', async () => {
    const desk = await sessionFor('frontdesk');
    const created = (await call('POST', '/api/patients', { cookie: desk, json: person(300) })).body.patient;
    const first = await call('PATCH', `/api/patients/${created.id}`, { cookie: desk, json: { version: created.version, phone: '+1 555 0199 777' } });
    expect(first.status).toBe(200);
    expect(first.body.patient).toMatchObject({ phone: '+1 555 0199 777', version: created.version + 1 });

    const stale = await call('PATCH', `/api/patients/${created.id}`, { cookie: desk, json: { version: created.version, phone: '+1 555 0199 888', city: 'Fernhollow' } });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('STALE');
    expect(stale.body.error.message).toMatch(/^Someone else changed/);
    const row = await Patient.findByPk(created.id);
    expect(row).toMatchObject({ phone: '+1 555 0199 777', city: 'Marrow Bay', version: created.version + 1 });

    const events = await AuditEvent.findAll({ where: { action: 'patient.update', entityId: String(created.id) } });
    expect(events.map((e) => e.detail)).toEqual([{ fields: ['phone'] }]);
  });

  it('an edit that changes nothing writes nothing', async () => {
    const desk = await sessionFor('frontdesk');
    const created = (await call('POST', '/api/patients', { cookie: desk, json: person(301) })).body.patient;
    const res = await call('PATCH', `/api/patients/${created.id}`, { cookie: desk, json: { version: 0, city: 'Marrow Bay' } });
    expect(res.body.patient.version).toBe(0);
    expect(await AuditEvent.count({ where: { action: 'patient.update', entityId: String(created.id) } })).toBe(0);
  });

  it('renaming a record into another patient’s identity needs the same confirmation', async () => {
    const desk = await sessionFor('frontdesk');
    const a = (await call('POST', '/api/patients', { cookie: desk, json: person(302) })).body.patient;
    const b = (await call('POST', '/api/patients', { cookie: desk, json: person(303) })).body.patient;
    const refused = await call('PATCH', `/api/patients/${b.id}`, { cookie: desk, json: { version: b.version, givenName: a.givenName } });
    expect(refused.status).toBe(409);
    expect(refused.body.error.code).toBe('POSSIBLE_DUPLICATE');
    expect(refused.body.error.candidates.map((c: { id: number }) => c.id)).toEqual([a.id]);
    expect((await Patient.findByPk(b.id))!.givenName).toBe(b.givenName);
    const ok = await call('PATCH', `/api/patients/${b.id}`, { cookie: desk, json: { version: b.version, givenName: a.givenName, confirmedNotDuplicate: true } });
    expect(ok.status).toBe(200);
    // Editing other fields of a record that shares its identity with another is not a new warning.
    const phone = await call('PATCH', `/api/patients/${b.id}`, { cookie: desk, json: { version: ok.body.patient.version, phone: '+1 555 0100 000' } });
    expect(phone.status).toBe(200);
  });

  it('404 for a patient that does not exist, 400 for a malformed id or an empty change', async () => {
    const desk = await sessionFor('frontdesk');
    expect((await call('GET', '/api/patients/987654', { cookie: desk })).status).toBe(404);
    expect((await call('PATCH', '/api/patients/987654', { cookie: desk, json: { version: 0, city: 'X' } })).status).toBe(404);
    expect((await call('GET', '/api/patients/abc', { cookie: desk })).status).toBe(400);
    expect((await call('PATCH', '/api/patients/1', { cookie: desk, json: { version: 0 } })).status).toBe(400);
  });
});

describe('who may do what with patients', () => {
  it('sonographers and reading physicians read; they cannot create or edit even with a valid body', async () => {
    for (const role of ['sonographer', 'radiologist'] as const) {
      const cookie = await sessionFor(role);
      expect((await call('GET', '/api/patients?q=a', { cookie })).status).toBe(200);
      expect((await call('GET', '/api/patients/1', { cookie })).status).toBe(200);
      const before = await Patient.count();
      const post = await call('POST', '/api/patients', { cookie, json: person(400) });
      expect(post.status).toBe(403);
      const row = (await Patient.findByPk(1))!;
      const patch = await call('PATCH', '/api/patients/1', { cookie, json: { version: row.version, city: 'Elsewhere' } });
      expect(patch.status).toBe(403);
      expect(await Patient.count()).toBe(before);
      expect((await Patient.findByPk(1))!.city).toBe(row.city);
    }
  });

  it('a referring clinician sees no patient directory at all', async () => {
    const cookie = await sessionFor('referrer');
    expect((await call('GET', '/api/patients?q=a', { cookie })).status).toBe(403);
    expect((await call('GET', '/api/patients/1', { cookie })).status).toBe(403);
    expect((await call('GET', '/patients/1', { cookie })).status).toBe(403);
  });

  it('the record page shows the exams newest first, with "Book an exam" for the desk only', async () => {
    const withExams = (await Exam.findAll({ attributes: ['patientId'], order: [['patientId', 'ASC']] })).map((e) => e.patientId);
    const patientId = withExams.find((id, i) => withExams.indexOf(id) !== i)!;
    const exams = await listPatientExams(patientId, 'America/Chicago');
    expect(exams.length).toBeGreaterThanOrEqual(2);
    const keys = exams.map((e) => `${e.date} ${e.time}`);
    expect(keys).toEqual([...keys].sort().reverse());
    const page = await call('GET', `/patients/${patientId}`, { cookie: await sessionFor('sonographer') });
    expect(page.status).toBe(200);
    expect(page.body).not.toContain(`/exams/new?patientId=${patientId}`);
    expect(page.body).toContain(exams[0]!.accessionNumber);
    const deskPage = await call('GET', `/patients/${patientId}`, { cookie: await sessionFor('frontdesk') });
    expect(deskPage.body).toContain(`href="/exams/new?patientId=${patientId}"`);
    expect((await call('GET', '/patients/987654', { cookie: await sessionFor('frontdesk') })).status).toBe(404);
  });
});
