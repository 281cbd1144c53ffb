// Shared vocabulary of the clinical engine. Plain types only, so the browser and the
// server (and the DB seeders) can import them without pulling in any code.

/** Sex as used for reference-range selection; anything else means "not applied". */
export type Sex = 'male' | 'female';

/** Sex as it may arrive from the patient record. */
export type PatientSex = Sex | 'other' | 'unknown' | null | undefined;

/** Provenance tags of CLINICAL.md §0.1: SRC+ verified, SRC~ secondary, CP common practice, MEM unverified. */
export type ProvenanceTag = 'SRC+' | 'SRC~' | 'CP' | 'MEM';

export type ImagingMode = 'B-mode' | 'M-mode' | 'Doppler';

export type ProbeKind = 'linear' | 'curvilinear' | 'phased-array';

export type TemplateId = 'thyroid' | 'abdomen' | 'echo';

/** A measurement that was attempted but could not be obtained (e.g. no usable TR jet). */
export const NOT_MEASURABLE = 'not-measurable';
/** A measurement that was not part of this exam; same meaning as leaving the field out. */
export const NOT_DONE = 'not-done';

export type MeasurementState = typeof NOT_MEASURABLE | typeof NOT_DONE;

/** What a numeric field holds: a number in the field's declared unit, or an explicit state. */
export type NumericEntry = number | MeasurementState;

/** What any field holds: numeric entries, or the option value of a choice field. */
export type FieldEntry = NumericEntry | string;

/** Measurements of one exam keyed by field code, e.g. `{ lviddCm: 5.0, trVelocityMS: 'not-measurable' }`. */
export type Measurements = Readonly<Record<string, FieldEntry | undefined>>;

export type SeverityGrade = 'mild' | 'moderate' | 'severe';
