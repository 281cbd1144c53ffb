import { closeDb, createSequelize, db } from '../../src/db/connection';
import { testEnv } from './env';

/** The app's own connection pool, pointed at the test database by `npm test`. */
export function testDb() {
  testEnv();
  return db();
}

export { closeDb as closeTestDb, createSequelize };
