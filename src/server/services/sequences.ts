import type { Transaction } from 'sequelize';
import { Sequence } from '../../db/models';

/**
 * The next value of a named counter, inside the caller's transaction. The counter row stays
 * locked until that transaction ends, so two concurrent callers get different values, and a
 * value handed to a transaction that rolls back is simply skipped (never reused).
 *
 * @example const n = await nextValue('mrn', transaction); // 41
 */
export async function nextValue(name: string, transaction: Transaction): Promise<number> {
  // INSERT … ON DUPLICATE KEY UPDATE creates the row on first use and locks it either way.
  await Sequence.sequelize!.query(
    'INSERT INTO sequences (name, last_value, updated_at) VALUES (?, 1, UTC_TIMESTAMP()) ' +
      'ON DUPLICATE KEY UPDATE last_value = last_value + 1, updated_at = UTC_TIMESTAMP()',
    { replacements: [name], transaction },
  );
  const row = await Sequence.findByPk(name, { transaction, lock: transaction.LOCK.UPDATE });
  return Number(row!.lastValue);
}

/** Raises a counter to at least `value` (used by the demo seed after inserting its own rows). */
export async function raiseTo(name: string, value: number, transaction: Transaction): Promise<void> {
  await Sequence.sequelize!.query(
    'INSERT INTO sequences (name, last_value, updated_at) VALUES (?, ?, UTC_TIMESTAMP()) ' +
      'ON DUPLICATE KEY UPDATE last_value = GREATEST(last_value, VALUES(last_value)), updated_at = UTC_TIMESTAMP()',
    { replacements: [name, value], transaction },
  );
}
