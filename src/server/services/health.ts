import { db } from '../../db/connection';

/** Whether the database answers within two seconds. */
export async function databaseReachable(): Promise<boolean> {
  try {
    await Promise.race([
      db().query('SELECT 1'),
      new Promise((_, reject) => setTimeout(() => reject(new Error('timeout')), 2_000)),
    ]);
    return true;
  } catch {
    return false;
  }
}
