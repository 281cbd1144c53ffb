/**
 * Formats of the identifiers Crestline hands out. Generation that must be unique under
 * concurrency happens on the server; these only shape and check the strings.
 */

/** Medical record number, e.g. mrnFromNumber(123) → "P0000123". */
export function mrnFromNumber(n: number): string {
  return 'P' + String(n).padStart(7, '0');
}
export const MRN_PATTERN = /^P\d{7}$/;

/** Accession number: "A", the booking date (YYMMDD) and a 4-digit counter, e.g. "A2612020007". */
export function accessionFrom(isoDate: string, counter: number): string {
  return 'A' + isoDate.slice(2, 10).replaceAll('-', '') + String(counter).padStart(4, '0');
}
export const ACCESSION_PATTERN = /^A\d{10,14}$/;

/**
 * A DICOM UID under the "2.25" root from a UUID (DICOM PS3.5 B.2): the UUID's 128 bits as
 * one decimal integer, e.g. uidFromUuid('00000000-0000-0000-0000-000000000001') → "2.25.1".
 */
export function uidFromUuid(uuid: string): string {
  const hex = uuid.replaceAll('-', '');
  if (!/^[0-9a-fA-F]{32}$/.test(hex)) throw new Error('not a UUID');
  return '2.25.' + BigInt('0x' + hex).toString(10);
}
