import { dcmjs, EXPLICIT_VR_LITTLE_ENDIAN, newUid } from './dicom';

export const COMPREHENSIVE_SR = '1.2.840.10008.5.1.4.1.1.88.33';

export interface Coded {
  code: string;
  scheme: string;
  meaning: string;
}

export interface SrMeasurementSpec extends Coded {
  /** null writes a NUM with an empty Measured Value Sequence (no value, as PS3.3 allows). */
  value: number | null;
  /** UCUM code, e.g. 'mm', 'cm/s', 'ml'. */
  unit: string;
  /** A Measurement Method modifier (SCT 370129005), e.g. DCM 125207 "Method of Disks, Biplane". */
  method?: Coded;
}

export interface SrSpec {
  patientId: string;
  accessionNumber: string;
  studyInstanceUid?: string;
  patientName?: string;
  sopInstanceUid?: string;
  /** Default Comprehensive SR; e.g. …88.72 (Simplified Adult Echo SR) or …88.11 (Basic Text SR). */
  sopClassUid?: string;
  measurements: SrMeasurementSpec[];
}

// TID 5200's root and section concepts; the nesting is what the reader must walk through.
export const ROOT: Coded = { code: '125200', scheme: 'DCM', meaning: 'Adult Echocardiography Procedure Report' };
export const FINDINGS: Coded = { code: '121070', scheme: 'DCM', meaning: 'Findings' };
export const MEASUREMENT_GROUP: Coded = { code: '125007', scheme: 'DCM', meaning: 'Measurement Group' };
const MEASUREMENT_METHOD: Coded = { code: '370129005', scheme: 'SCT', meaning: 'Measurement Method' };

const codeSeq = (c: Coded) => [{ CodeValue: c.code, CodingSchemeDesignator: c.scheme, CodeMeaning: c.meaning }];

function num(m: SrMeasurementSpec): Record<string, unknown> {
  const measured =
    m.value === null
      ? []
      : [{ MeasurementUnitsCodeSequence: [{ CodeValue: m.unit, CodingSchemeDesignator: 'UCUM', CodeMeaning: m.unit }], NumericValue: m.value }];
  return {
    RelationshipType: 'CONTAINS',
    ValueType: 'NUM',
    ConceptNameCodeSequence: codeSeq(m),
    MeasuredValueSequence: measured,
    ...(m.method
      ? { ContentSequence: [{ RelationshipType: 'HAS CONCEPT MOD', ValueType: 'CODE', ConceptNameCodeSequence: codeSeq(MEASUREMENT_METHOD), ConceptCodeSequence: codeSeq(m.method) }] }
      : {}),
  };
}

const container = (concept: Coded, children: Record<string, unknown>[]) => ({
  RelationshipType: 'CONTAINS',
  ValueType: 'CONTAINER',
  ConceptNameCodeSequence: codeSeq(concept),
  ContinuityOfContent: 'SEPARATE',
  ContentSequence: children,
});

/**
 * A small echo report (Comprehensive SR unless told, explicit VR little endian) as a DICOM Part 10 file,
 * made by dcmjs: root "Adult Echocardiography Procedure Report" › "Findings" › "Measurement
 * Group" › one NUM per measurement, in the order given.
 */
export function makeEchoSr(spec: SrSpec): Uint8Array {
  const sop = spec.sopInstanceUid ?? newUid();
  const sopClass = spec.sopClassUid ?? COMPREHENSIVE_SR;
  const meta = {
    FileMetaInformationVersion: new Uint8Array([0, 1]).buffer,
    MediaStorageSOPClassUID: sopClass,
    MediaStorageSOPInstanceUID: sop,
    TransferSyntaxUID: EXPLICIT_VR_LITTLE_ENDIAN,
    ImplementationClassUID: '2.25.305828488182831875890203105390285383139',
  };
  const dataset: Record<string, unknown> = {
    SOPClassUID: sopClass,
    SOPInstanceUID: sop,
    StudyInstanceUID: spec.studyInstanceUid ?? newUid(),
    SeriesInstanceUID: newUid(),
    Modality: 'SR',
    SeriesNumber: 99,
    InstanceNumber: 1,
    PatientID: spec.patientId,
    PatientName: spec.patientName ?? 'Test^Patient',
    AccessionNumber: spec.accessionNumber,
    ContentDate: '20261203',
    ContentTime: '101530',
    CompletionFlag: 'COMPLETE',
    VerificationFlag: 'UNVERIFIED',
    ValueType: 'CONTAINER',
    ConceptNameCodeSequence: codeSeq(ROOT),
    ContinuityOfContent: 'SEPARATE',
    ContentTemplateSequence: [{ MappingResource: 'DCMR', TemplateIdentifier: '5200' }],
    ContentSequence: [container(FINDINGS, [container(MEASUREMENT_GROUP, spec.measurements.map(num))])],
  };
  const dict = new dcmjs.data.DicomDict(dcmjs.data.DicomMetaDictionary.denaturalizeDataset(meta));
  dict.dict = dcmjs.data.DicomMetaDictionary.denaturalizeDataset(dataset);
  return new Uint8Array(dict.write());
}
