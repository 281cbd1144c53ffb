// Stripe's form encoding: `metadata[exam_id]=12`, `payment_method_types[]=card` (curl style) and
// `payment_method_types[0]=card` (what the SDK sends) become nested objects and arrays. Objects are
// built without a prototype so a key like `__proto__` is just a key.
import { badParam } from './errors.mjs';

/** @typedef {string | any[] | { [key: string]: any }} FormValue  strings, lists and hashes, nested */
/** @typedef {{ [key: string]: FormValue }} FormParams */

const KEY = /^([^[\]]+)((?:\[[^[\]]*\])*)$/;

/**
 * @param {string} text `a=1&b[c]=2`, from a body or a query string
 * @returns {FormParams}
 */
export function parseForm(text) {
  /** @type {any} */
  const root = Object.create(null);
  for (const [rawKey, value] of new URLSearchParams(text)) {
    const m = KEY.exec(rawKey);
    if (!m) throw badParam(`Invalid parameter name: ${rawKey}`, rawKey);
    const path = [m[1], ...[...m[2].matchAll(/\[([^[\]]*)\]/g)].map((x) => x[1])];
    let node = root;
    for (let i = 0; i < path.length; i++) {
      const last = i === path.length - 1;
      // `[]` appends to a list; `[0]` and `[name]` are keys (index keys become a list at the end).
      const seg = path[i] === '' ? (Array.isArray(node) ? String(node.length) : null) : path[i];
      if (seg === null) throw badParam(`Invalid array: ${path.slice(0, i).join('.')}`, rawKey);
      if (last) {
        if (typeof node[seg] === 'object') throw badParam(`Invalid value for ${rawKey}: it is also given as a hash`, rawKey);
        node[seg] = value;
      } else {
        if (node[seg] === undefined) node[seg] = path[i + 1] === '' ? [] : Object.create(null);
        if (typeof node[seg] !== 'object') throw badParam(`Invalid hash: ${rawKey} (the parameter is also given as a plain value)`, rawKey);
        node = node[seg];
      }
    }
  }
  return /** @type {FormParams} */ (listify(root));
}

/** Turns objects whose keys are all 0..n-1 into arrays, depth first. */
function listify(value) {
  if (typeof value !== 'object') return value;
  if (Array.isArray(value)) return value.map(listify);
  const keys = Object.keys(value);
  for (const k of keys) value[k] = listify(value[k]);
  const indexed = keys.length > 0 && keys.every((k) => /^(0|[1-9]\d*)$/.test(k));
  if (!indexed) return value;
  const items = keys.map(Number).sort((a, b) => a - b);
  if (items.some((n, i) => n !== i)) return value;
  return items.map((n) => value[n]);
}

/** A stable text form of parsed params (sorted keys), to tell whether two requests are the same. */
export function fingerprint(value) {
  if (typeof value !== 'object') return JSON.stringify(value);
  if (Array.isArray(value)) return `[${value.map(fingerprint).join(',')}]`;
  return `{${Object.keys(value).sort().map((k) => `${JSON.stringify(k)}:${fingerprint(value[k])}`).join(',')}}`;
}
