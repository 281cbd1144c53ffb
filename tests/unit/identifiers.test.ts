import { describe, expect, it } from 'vitest';
import { accessionFrom, ACCESSION_PATTERN, mrnFromNumber, MRN_PATTERN, uidFromUuid } from '../../src/lib/identifiers';

describe('uidFromUuid (DICOM PS3.5 annex B.2, "2.25" root)', () => {
  it('writes the UUID as one decimal integer', () => {
    expect(uidFromUuid('00000000-0000-0000-0000-000000000001')).toBe('2.25.1');
    // 2^128 − 1, the largest UUID value.
    expect(uidFromUuid('ffffffff-ffff-ffff-ffff-ffffffffffff')).toBe('2.25.340282366920938463463374607431768211455');
  });
  it('stays within the 64-character limit of a DICOM UID', () => {
    expect(uidFromUuid('ffffffff-ffff-ffff-ffff-ffffffffffff').length).toBeLessThanOrEqual(64);
  });
  it('refuses a string that is not a UUID', () => {
    expect(() => uidFromUuid('not-a-uuid')).toThrow();
  });
});

describe('record numbers', () => {
  it('formats MRNs and accession numbers that match their patterns', () => {
    expect(mrnFromNumber(123)).toBe('P0000123');
    expect(MRN_PATTERN.test(mrnFromNumber(9_999_999))).toBe(true);
    expect(accessionFrom('2026-12-02', 7)).toBe('A2612020007');
    expect(ACCESSION_PATTERN.test(accessionFrom('2026-12-02', 7))).toBe(true);
    // An accession number fits DICOM's SH value representation (16 characters).
    expect(accessionFrom('2026-12-02', 9999).length).toBeLessThanOrEqual(16);
  });
});
