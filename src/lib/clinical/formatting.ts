import { roundHalfUp } from './rounding';
import { unitSymbol, type Unit } from './units';

/** Fixed-decimal text using the engine's one rounding rule, e.g. `formatNumber(0.375, 2) === '0.38'`. */
export function formatNumber(value: number, decimals: number): string {
  const rounded = roundHalfUp(value, decimals);
  // Avoid printing "-0.0" for tiny negative values.
  return (Object.is(rounded, -0) ? 0 : rounded).toFixed(decimals);
}

/** Number with its unit, e.g. `formatQuantity(100.09, 'g/m2', 0) === '100 g/m²'`. */
export function formatQuantity(value: number, unit: Unit, decimals: number): string {
  const symbol = unitSymbol(unit);
  const number = formatNumber(value, decimals);
  if (symbol === '') return number;
  return symbol === '%' ? `${number} %` : `${number} ${symbol}`;
}

/** Range text, e.g. `formatRange(43, 95, 'g/m2', 0) === '43–95 g/m²'`, `formatRange(null, 34, 'mL/m2', 0) === '≤ 34 mL/m²'`. */
export function formatRange(min: number | null, max: number | null, unit: Unit, decimals: number): string {
  const symbol = unitSymbol(unit);
  const suffix = symbol === '' ? '' : ` ${symbol}`;
  if (min !== null && max !== null) return `${formatNumber(min, decimals)}–${formatNumber(max, decimals)}${suffix}`;
  if (max !== null) return `≤ ${formatNumber(max, decimals)}${suffix}`;
  if (min !== null) return `≥ ${formatNumber(min, decimals)}${suffix}`;
  return 'no limit';
}

/** Join words as an English list, e.g. `joinList(['a', 'b', 'c']) === 'a, b and c'`. */
export function joinList(items: readonly string[]): string {
  if (items.length <= 1) return items.join('');
  return `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`;
}

/** Capitalise the first letter, e.g. `sentenceCase('right lobe') === 'Right lobe'`. */
export const sentenceCase = (text: string): string => text.charAt(0).toUpperCase() + text.slice(1);

/**
 * A label as it reads inside a sentence: "Mitral E velocity" → "mitral E velocity", while
 * acronyms stay as they are ("IVSd", "LVEF", "RV S′", "E/A").
 */
export function inlineLabel(label: string): string {
  const second = label.charAt(1);
  return second !== '' && second === second.toLowerCase() && second !== second.toUpperCase() ? label.charAt(0).toLowerCase() + label.slice(1) : label;
}
