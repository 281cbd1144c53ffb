import { describe, expect, it } from 'vitest';
import { canMoveExam, EXAM_STATUSES } from '../../src/lib/exam-status';

describe('canMoveExam (FHIR Appointment lifecycle, DESIGN.md)', () => {
  it('follows booked → arrived → in-progress → completed', () => {
    expect(canMoveExam('booked', 'arrived')).toBe(true);
    expect(canMoveExam('arrived', 'in-progress')).toBe(true);
    expect(canMoveExam('in-progress', 'completed')).toBe(true);
  });
  it('allows cancel and no-show only from booked or arrived', () => {
    for (const from of EXAM_STATUSES) {
      const expected = from === 'booked' || from === 'arrived';
      expect(canMoveExam(from, 'cancelled'), from).toBe(expected);
      expect(canMoveExam(from, 'noshow'), from).toBe(expected);
    }
  });
  it('never leaves a closed state', () => {
    for (const closed of ['completed', 'cancelled', 'noshow'] as const) {
      for (const to of EXAM_STATUSES) expect(canMoveExam(closed, to)).toBe(false);
    }
  });
  it('does not skip arrival', () => {
    expect(canMoveExam('booked', 'in-progress')).toBe(false);
    expect(canMoveExam('booked', 'completed')).toBe(false);
  });
});
