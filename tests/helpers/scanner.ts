import { execFile } from 'node:child_process';
import { createRequire } from 'node:module';
import { mkdtemp, readdir, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type * as DimseTypes from 'dcmjs-dimse';
import { decoderFor, trimDicom } from '../../src/server/dicom/identifiers';
import { parsePart10 } from '../../src/lib/dicom/frames';

/**
 * The outside scanner for the tests: dcmtk's command-line tools (echoscu, findscu, storescu)
 * and dcmjs-dimse's client for procedure steps, all talking to the DICOM listener that
 * `npm test` started.
 */
export const DICOM = {
  host: '127.0.0.1',
  port: Number(process.env.DICOM_PORT),
  aeTitle: process.env.DICOM_AE_TITLE ?? 'CRESTLINE',
};

export interface ToolRun {
  code: number;
  stdout: string;
  stderr: string;
}

/** Runs a dcmtk tool against the listener: `tool [args…] host port [files…]`. */
export function dcmtk(tool: string, args: string[], files: string[] = []): Promise<ToolRun> {
  return new Promise((resolve) => {
    execFile(tool, [...args, DICOM.host, String(DICOM.port), ...files], { timeout: 60_000, maxBuffer: 16 * 1024 * 1024 }, (error, stdout, stderr) => {
      resolve({ code: error ? Number((error as NodeJS.ErrnoException & { code?: number }).code ?? 1) || 1 : 0, stdout, stderr });
    });
  });
}

/** One worklist answer read back from findscu's files: strings by tag, decoded with the answer's character set. */
export type Answer = { text: (tag: string) => string; stepText: (tag: string) => string };

/**
 * `findscu -W` as a scanner would send it, with the keys given (dcmtk's -k syntax), the answers
 * written as files (-X) and read back.
 */
export async function worklistQuery(callingAe: string, keys: string[]): Promise<{ run: ToolRun; answers: Answer[] }> {
  const dir = await mkdtemp(path.join(tmpdir(), 'crestline-findscu-'));
  try {
    const run = await dcmtk('findscu', ['-W', '-X', '-od', dir, '-aet', callingAe, '-aec', DICOM.aeTitle, ...keys.flatMap((k) => ['-k', k])]);
    const files = (await readdir(dir)).filter((f) => f.startsWith('rsp')).sort();
    const answers = await Promise.all(files.map(async (f) => readAnswer(await readFile(path.join(dir, f)))));
    return { run, answers };
  } finally {
    await rm(dir, { recursive: true, force: true });
  }
}

function readAnswer(bytes: Buffer): Answer {
  const ds = parsePart10(bytes);
  const decoder = decoderFor(ds.string('x00080005'));
  const textIn = (set: typeof ds) => (tag: string) => {
    const el = set.elements[tag];
    return el ? trimDicom(decoder.decode(set.byteArray.subarray(el.dataOffset, el.dataOffset + el.length))) : '';
  };
  const step = ds.elements.x00400100?.items?.[0]?.dataSet;
  return { text: textIn(ds), stepText: step ? textIn(step) : () => '' };
}

/** `storescu` of one or more Part 10 files written to a temporary folder. */
export async function storeFiles(callingAe: string, objects: Uint8Array[], extra: string[] = []): Promise<ToolRun> {
  const dir = await mkdtemp(path.join(tmpdir(), 'crestline-storescu-'));
  try {
    const files = await Promise.all(objects.map(async (o, i) => {
      const file = path.join(dir, `object-${i}.dcm`);
      await writeFile(file, o);
      return file;
    }));
    return await dcmtk('storescu', ['-aet', callingAe, '-aec', DICOM.aeTitle, ...extra], files);
  } finally {
    await rm(dir, { recursive: true, force: true });
  }
}

type Dimse = typeof DimseTypes;
const dimse = createRequire(import.meta.url)('dcmjs-dimse') as Dimse;
dimse.log.setLevel('error');
export { dimse };

export interface DimseResult {
  status: number;
  errorComment: string;
}

/** Sends one request with dcmjs-dimse's client and resolves with the status of its (last) response. */
export function sendRequest(callingAe: string, request: InstanceType<Dimse['requests']['Request']>): Promise<DimseResult> {
  return new Promise((resolve, reject) => {
    const client = new dimse.Client();
    let result: DimseResult | undefined;
    request.on('response', (response: InstanceType<Dimse['responses']['Response']>) => {
      result = { status: response.getStatus(), errorComment: (response as unknown as { getErrorComment(): string }).getErrorComment?.() ?? '' };
    });
    client.on('networkError', reject);
    client.on('associationRejected', (r: unknown) => reject(new Error(`association rejected: ${JSON.stringify(r)}`)));
    client.on('closed', () => (result ? resolve(result) : reject(new Error('no response'))));
    client.addRequest(request);
    client.send(DICOM.host, DICOM.port, callingAe, DICOM.aeTitle);
  });
}

const MPPS = '1.2.840.10008.3.1.2.3.3';

/** MPPS N-CREATE "IN PROGRESS" for a scheduled exam, as a scanner sends it when the scan starts. */
export function stepInProgress(callingAe: string, step: { uid: string; patientId: string; accessionNumber: string; studyInstanceUid: string; start?: [string, string] }): Promise<DimseResult> {
  const request = new dimse.requests.NCreateRequest(MPPS, step.uid);
  request.setDataset(
    new dimse.Dataset({
      SpecificCharacterSet: 'ISO_IR 192',
      PatientID: step.patientId,
      ScheduledStepAttributesSequence: [{ AccessionNumber: step.accessionNumber, StudyInstanceUID: step.studyInstanceUid, ScheduledProcedureStepID: step.accessionNumber }],
      PerformedStationAETitle: callingAe,
      PerformedProcedureStepStartDate: step.start?.[0] ?? '',
      PerformedProcedureStepStartTime: step.start?.[1] ?? '',
      PerformedProcedureStepStatus: 'IN PROGRESS',
      Modality: 'US',
    }),
  );
  return sendRequest(callingAe, request);
}

/** MPPS N-SET that ends a step: COMPLETED, or DISCONTINUED with a coded reason (CID 9300). */
export function stepEnded(callingAe: string, uid: string, status: 'COMPLETED' | 'DISCONTINUED', reason?: { code: string; meaning: string }): Promise<DimseResult> {
  const request = new dimse.requests.NSetRequest(MPPS, uid);
  request.setDataset(
    new dimse.Dataset({
      PerformedProcedureStepStatus: status,
      PerformedProcedureStepEndDate: '',
      PerformedProcedureStepEndTime: '',
      ...(reason ? { PerformedProcedureStepDiscontinuationReasonCodeSequence: [{ CodeValue: reason.code, CodingSchemeDesignator: 'DCM', CodeMeaning: reason.meaning }] } : {}),
    }),
  );
  return sendRequest(callingAe, request);
}
