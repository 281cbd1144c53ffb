import { afterAll, describe, expect, it } from 'vitest';
import { ForeignKeyConstraintError, UniqueConstraintError, type Transaction } from 'sequelize';
import { Exam, ExamType, Patient, Referrer, User } from '../../src/db/models';
import { closeTestDb, testDb } from '../helpers/db';

afterAll(closeTestDb);

/** Runs a check inside a transaction that is always rolled back, so the data stays as seeded. */
async function inRollback(fn: (t: Transaction) => Promise<void>): Promise<void> {
  const t = await testDb().transaction();
  try {
    await fn(t);
  } finally {
    await t.rollback();
  }
}

describe('database constraints', () => {
  it('refuse a second patient with the same MRN', async () => {
    await inRollback(async (transaction) => {
      const existing = await Patient.findOne({ transaction });
      await expect(
        Patient.create(
          { mrn: existing!.mrn, familyName: 'Test', givenName: 'Dup', birthDate: '1970-01-01', sex: 'female', email: null, phone: null, addressLine: null, city: null, postalCode: null },
          { transaction },
        ),
      ).rejects.toBeInstanceOf(UniqueConstraintError);
    });
  });

  it('refuse a second user with the same e-mail', async () => {
    await inRollback(async (transaction) => {
      const existing = await User.findOne({ transaction });
      await expect(
        User.create({ email: existing!.email, displayName: 'X', role: 'frontdesk', passwordHash: 'x', referrerId: null }, { transaction }),
      ).rejects.toBeInstanceOf(UniqueConstraintError);
    });
  });

  it('refuse a reused accession number', async () => {
    await inRollback(async (transaction) => {
      const e = await Exam.findOne({ transaction });
      const copy = { ...e!.get({ plain: true }), id: undefined, studyInstanceUid: '2.25.42' } as Record<string, unknown>;
      delete copy.id;
      await expect(Exam.create(copy as never, { transaction })).rejects.toBeInstanceOf(UniqueConstraintError);
    });
  });

  it('refuse an exam for a patient that does not exist', async () => {
    await inRollback(async (transaction) => {
      const e = await Exam.findOne({ transaction });
      const copy = { ...e!.get({ plain: true }), accessionNumber: 'A9999999999', studyInstanceUid: '2.25.43', patientId: 987654 } as Record<string, unknown>;
      delete copy.id;
      await expect(Exam.create(copy as never, { transaction })).rejects.toBeInstanceOf(ForeignKeyConstraintError);
    });
  });

  it('refuse deleting an exam type that exams use', async () => {
    await inRollback(async (transaction) => {
      const type = await ExamType.findOne({ transaction });
      await expect(type!.destroy({ transaction })).rejects.toBeInstanceOf(ForeignKeyConstraintError);
    });
  });

  it('refuse deleting a referrer linked to a user account', async () => {
    await inRollback(async (transaction) => {
      const linked = await User.findOne({ where: { role: 'referrer' }, transaction });
      const referrer = await Referrer.findByPk(linked!.referrerId!, { transaction });
      await expect(referrer!.destroy({ transaction })).rejects.toBeInstanceOf(ForeignKeyConstraintError);
    });
  });

  it('store names in full Unicode (utf8mb4)', async () => {
    await inRollback(async (transaction) => {
      const p = await Patient.create(
        { mrn: 'P9999998', familyName: 'Ødegård-Nguyễn', givenName: 'Zoë 🌊', birthDate: '1980-02-29', sex: 'other', email: null, phone: null, addressLine: null, city: null, postalCode: null },
        { transaction },
      );
      const back = await Patient.findByPk(p.id, { transaction });
      expect(back!.familyName).toBe('Ødegård-Nguyễn');
      expect(back!.givenName).toBe('Zoë 🌊');
      expect(back!.birthDate).toBe('1980-02-29');
    });
  });
});
