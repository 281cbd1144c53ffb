/**
 * The manager's edits of the catalog, one file per kind of thing (exam types, rooms, scanners,
 * probes) over shared helpers. Each use-case is one transaction with its audit entry; an edit
 * names the version it was opened with (409 when someone saved first). Nothing is deleted: exams
 * keep pointing at the exam type, room and scanner they were booked with, and keep the price and
 * deposit copied at booking, so no change here rewrites a past exam.
 */
export * from './exam-types';
export * from './rooms';
export * from './scanners';
export * from './probes';
