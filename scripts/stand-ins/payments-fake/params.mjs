// Reading and checking request parameters the way Stripe does: every value arrives as a string
// (form encoding), unknown parameters are refused (so a typo in our code fails here, not in
// production), and each refusal names the parameter.
import { badParam } from './errors.mjs';

/** @typedef {import('./form.mjs').FormParams} FormParams */

/**
 * Refuses any top-level parameter not in `allowed` ("Received unknown parameter: foo").
 * @param {FormParams} params
 * @param {string[]} allowed
 * @param {string} [within] the enclosing parameter, for nested hashes
 */
export function onlyKnown(params, allowed, within = '') {
  for (const key of Object.keys(params)) {
    const name = within ? `${within}[${key}]` : key;
    if (!allowed.includes(key)) throw badParam(`Received unknown parameter: ${name}`, name, 'parameter_unknown');
  }
}

/** @returns {string | undefined} */
export function str(params, name, { required = false, max = 5000 } = {}) {
  const v = params[name];
  if (v === undefined || v === '') {
    if (required) throw badParam(`Missing required param: ${name}.`, name, 'parameter_missing');
    return undefined;
  }
  if (typeof v !== 'string') throw badParam(`Invalid string: ${name} must be a string, not a hash or list.`, name);
  if (v.length > max) throw badParam(`Invalid string: ${name} must be at most ${max} characters.`, name, 'parameter_invalid_string');
  return v;
}

/** A whole number of minor units, at least 1. @returns {number | undefined} */
export function positiveInt(params, name, { required = false } = {}) {
  const v = str(params, name, { required });
  if (v === undefined) return undefined;
  if (!/^-?\d+$/.test(v) || !Number.isSafeInteger(Number(v))) throw badParam(`Invalid integer: ${v}`, name, 'parameter_invalid_integer');
  const n = Number(v);
  if (n < 1) throw badParam('This value must be greater than or equal to 1.', name, 'parameter_invalid_integer');
  return n;
}

/** @returns {boolean | undefined} */
export function bool(params, name) {
  const v = str(params, name);
  if (v === undefined) return undefined;
  if (v !== 'true' && v !== 'false') throw badParam(`Invalid boolean: ${v}`, name);
  return v === 'true';
}

/** @returns {string | undefined} */
export function oneOf(params, name, values) {
  const v = str(params, name);
  if (v === undefined || values.includes(v)) return v;
  throw badParam(`Invalid ${name}: must be one of ${values.join(', ')}`, name);
}

/** Three letters; Stripe accepts any case and answers in lowercase. */
export function currency(params) {
  const v = /** @type {string} */ (str(params, 'currency', { required: true }));
  if (!/^[a-zA-Z]{3}$/.test(v)) throw badParam(`Invalid currency: ${v}. Use a three-letter ISO currency code, such as usd.`, 'currency');
  return v.toLowerCase();
}

export function email(params, name) {
  const v = str(params, name, { max: 800 });
  if (v !== undefined && !/^[^\s@]+@[^\s@]+\.[^\s@]+$/.test(v)) throw badParam(`Invalid email address: ${v}`, name, 'email_invalid');
  return v;
}

/**
 * Stripe's metadata limits: up to 50 keys, keys up to 40 characters, values up to 500, strings only.
 * An empty value means "no such key" (that is how Stripe unsets a key).
 * @returns {Record<string, string>}
 */
export function metadata(params, name = 'metadata') {
  let v = params[name];
  if (v === undefined || v === '') return {};
  if (Array.isArray(v)) v = Object.fromEntries(v.map((x, i) => [String(i), x])); // `metadata[0]=…` is a key "0"
  if (typeof v !== 'object') throw badParam('Invalid metadata: metadata must be a hash of keys and values.', name);
  const entries = Object.entries(v).filter(([, value]) => value !== '');
  if (entries.length > 50) throw badParam(`Invalid metadata: metadata can have up to 50 keys, but you passed in ${entries.length} keys.`, name);
  for (const [key, value] of entries) {
    const param = `${name}[${key}]`;
    if (typeof value !== 'string') throw badParam(`Invalid metadata: the value of ${param} must be a string.`, param);
    if (key.length > 40) throw badParam(`Invalid metadata: keys can be up to 40 characters long, but ${param} is ${key.length}.`, param);
    if (value.length > 500) throw badParam(`Invalid metadata: values can be up to 500 characters long, but ${param} is ${value.length}.`, param);
  }
  return Object.fromEntries(entries);
}

/** `expand[]=latest_charge`: a list of field names the caller may have expanded into objects. */
export function expand(params, allowed) {
  const v = params.expand;
  if (v === undefined || v === '') return [];
  const list = Array.isArray(v) ? v : [v];
  for (const field of list) {
    if (typeof field !== 'string' || !allowed.includes(field)) {
      throw badParam(`This property cannot be expanded (${typeof field === 'string' ? field : '?'}).`, 'expand');
    }
  }
  return /** @type {string[]} */ (list);
}
