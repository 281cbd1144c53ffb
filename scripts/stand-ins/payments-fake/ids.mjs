// Ids shaped like Stripe's: a prefix, an underscore and 24 random letters and digits.
import { randomBytes } from 'node:crypto';

const ALPHABET = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789';

/** @param {string} prefix e.g. 'pi', 'ch', 're', 'evt', 'req' */
export function newId(prefix, length = 24) {
  let s = '';
  for (const b of randomBytes(length)) s += ALPHABET[b % ALPHABET.length];
  return `${prefix}_${s}`;
}

/** Unix time in whole seconds, as Stripe's `created` fields are. */
export function unixNow() {
  return Math.floor(Date.now() / 1000);
}
