import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Sequelize } from 'sequelize';
import { migrator } from '../../src/db/migrator';
import { createSequelize, testDb } from '../helpers/db';
import { testEnv } from '../helpers/env';

// A separate, empty database next to the test database: migrations must build the schema
// from nothing, take it all down again, and build it again.
const SCRATCH = 'crestline_test_migrations';
let scratch: Sequelize;

beforeAll(async () => {
  await testDb().query(`DROP DATABASE IF EXISTS ${SCRATCH}`);
  await testDb().query(`CREATE DATABASE ${SCRATCH} CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
  scratch = createSequelize(testEnv().databaseUrl.replace(/\/crestline_test$/, `/${SCRATCH}`));
});

afterAll(async () => {
  await scratch.close();
  await testDb().query(`DROP DATABASE IF EXISTS ${SCRATCH}`);
});

async function tables(): Promise<string[]> {
  const [rows] = await scratch.query(
    `SELECT table_name AS name FROM information_schema.tables WHERE table_schema = '${SCRATCH}' ORDER BY table_name`,
  );
  return (rows as Array<{ name: string }>).map((r) => r.name);
}

describe('migrations', () => {
  const expected = ['SequelizeMeta', 'audit_events', 'exam_types', 'exams', 'patients', 'probes', 'referrers', 'rooms', 'scanners', 'settings', 'users'];

  it('build every table from an empty database', async () => {
    const applied = await migrator(scratch).up();
    expect(applied.length).toBeGreaterThanOrEqual(5);
    expect(await tables()).toEqual(expect.arrayContaining(expected));
  });

  it('use utf8mb4 and InnoDB for every table', async () => {
    const [rows] = await scratch.query(
      `SELECT table_name AS name, engine, table_collation AS collation FROM information_schema.tables WHERE table_schema = '${SCRATCH}'`,
    );
    // umzug creates its own log table (SequelizeMeta) in utf8; it holds only ASCII file names.
    for (const row of (rows as Array<{ name: string; engine: string; collation: string }>).filter((r) => r.name !== 'SequelizeMeta')) {
      expect(row.engine, row.name).toBe('InnoDB');
      expect(row.collation, row.name).toMatch(/^utf8mb4_/);
    }
  });

  it('index the columns the worklist queries by', async () => {
    const [rows] = await scratch.query(
      `SELECT DISTINCT index_name AS name FROM information_schema.statistics WHERE table_schema = '${SCRATCH}' AND table_name = 'exams'`,
    );
    const names = (rows as Array<{ name: string }>).map((r) => r.name);
    expect(names).toEqual(expect.arrayContaining(['exams_start', 'exams_status_start', 'exams_room_start', 'exams_sonographer_start']));
  });

  it('roll all the way back, leaving only the migration log', async () => {
    await migrator(scratch).down({ to: 0 });
    expect(await tables()).toEqual(['SequelizeMeta']);
  });

  it('apply again after a full rollback', async () => {
    await migrator(scratch).up();
    expect(await tables()).toEqual(expect.arrayContaining(expected));
    expect(await migrator(scratch).pending()).toEqual([]);
  });
});
