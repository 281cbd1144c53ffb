import { randomBytes } from 'node:crypto';
import { Writable } from 'node:stream';
import * as dimseNamespace from 'dcmjs-dimse';
import type { association, requests } from 'dcmjs-dimse';
import { db } from '../../db/connection';
import { Scanner } from '../../db/models';
import { log } from '../log';
import { clinicProfile } from '../services/settings';
import { trimDicom, parseDicomDateTime, toInstant } from './identifiers';
import { encodeCommand, encodeDataset, type EncodableDataset } from './encode';
import { toPart10 } from './part10';
import { stepChanged, stepStarted, type StepAnswer } from './procedure-steps';
import { receiveObject, type ReceiveOutcome } from './receive';
import { queryText, readQuery, requestedOnly, worklistItem, worklistRows } from './worklist-find';

/** dcmjs-dimse is one UMD bundle: Node's ESM loader sees it as a default export only. */
const dimse: typeof dimseNamespace = (dimseNamespace as unknown as { default?: typeof dimseNamespace }).default ?? dimseNamespace;
const { Dataset, Scp, Server } = dimse;
type Association = association.Association;
type PresentationContext = association.PresentationContext;
type CFindRequest = requests.CFindRequest;
type CStoreRequest = requests.CStoreRequest;
type NCreateRequest = requests.NCreateRequest;
type NSetRequest = requests.NSetRequest;
const { CEchoResponse, CFindResponse, CStoreResponse, NCreateResponse, NSetResponse } = dimse.responses;
const { Status, PresentationContextResult, RejectResult, RejectSource, RejectReason, TransferSyntax } = dimse.constants;

export const SOP = {
  verification: '1.2.840.10008.1.1',
  worklistFind: '1.2.840.10008.5.1.4.31',
  performedStep: '1.2.840.10008.3.1.2.3.3',
} as const;

/**
 * Storage classes Crestline keeps: ultrasound single- and multi-frame images, secondary
 * captures and structured reports (PS3.4 B.5). Any other object is declined at association.
 */
const STORAGE = new Set([
  '1.2.840.10008.5.1.4.1.1.6.1', // Ultrasound Image
  '1.2.840.10008.5.1.4.1.1.3.1', // Ultrasound Multi-frame Image
  '1.2.840.10008.5.1.4.1.1.7', // Secondary Capture Image
  '1.2.840.10008.5.1.4.1.1.7.1', // Multi-frame Single Bit Secondary Capture
  '1.2.840.10008.5.1.4.1.1.7.2', // Multi-frame Grayscale Byte Secondary Capture
  '1.2.840.10008.5.1.4.1.1.7.3', // Multi-frame Grayscale Word Secondary Capture
  '1.2.840.10008.5.1.4.1.1.7.4', // Multi-frame True Color Secondary Capture
  '1.2.840.10008.5.1.4.1.1.88.11', // Basic Text SR
  '1.2.840.10008.5.1.4.1.1.88.22', // Enhanced SR
  '1.2.840.10008.5.1.4.1.1.88.33', // Comprehensive SR
  '1.2.840.10008.5.1.4.1.1.88.34', // Comprehensive 3D SR
  '1.2.840.10008.5.1.4.1.1.88.35', // Extensible SR
]);

/** Transfer syntaxes Crestline reads itself (worklist queries, procedure steps). */
const PLAIN_SYNTAXES = [TransferSyntax.ExplicitVRLittleEndian, TransferSyntax.ImplicitVRLittleEndian];

export interface ListenerOptions {
  host: string;
  port: number;
  aeTitle: string;
  /** How long the list of scanner AE titles is reused before the catalog is read again. */
  catalogCacheMs?: number;
}

let scannerCache: { at: number; titles: Set<string> } | null = null;
let options: Required<ListenerOptions>;

/** The AE titles of active scanners in the catalog: the only callers let in. */
async function scannerTitles(): Promise<Set<string>> {
  if (scannerCache && Date.now() - scannerCache.at < options.catalogCacheMs) return scannerCache.titles;
  const rows = await Scanner.findAll({ where: { active: true }, attributes: ['aeTitle'] });
  scannerCache = { at: Date.now(), titles: new Set(rows.map((r) => r.aeTitle.trim())) };
  return scannerCache.titles;
}

/** A C-STORE data set collected as received (no decoding), for storing byte for byte. */
class RawCollector extends Writable {
  readonly chunks: Buffer[] = [];
  bytes = 0;
  override _write(chunk: Buffer, _encoding: BufferEncoding, done: (error?: Error | null) => void): void {
    this.chunks.push(chunk);
    this.bytes += chunk.length;
    done();
  }
}

type RawDataset = InstanceType<typeof Dataset> & { raw?: RawCollector; transferSyntax?: string };

/** An answer data set written once by our own encoder; dcmjs-dimse sends its bytes as they are. */
class EncodedDataset extends Dataset {
  private readonly bytes: Buffer;
  constructor(
    private readonly elements: EncodableDataset,
    transferSyntaxUid: string,
  ) {
    super({}, transferSyntaxUid);
    this.bytes = encodeDataset(elements, transferSyntaxUid);
  }
  override getElements(): Record<string, unknown> {
    return this.elements;
  }
  override getDenaturalizedDataset(): Buffer {
    return this.bytes;
  }
}

const dicomStatus: Record<StepAnswer extends infer A ? (A extends { ok: false; refusal: infer R } ? R & string : never) : never, number> = {
  invalid: Status.InvalidAttributeValue,
  duplicate: Status.DuplicateSOPInstance,
  'unknown-step': Status.NoSuchObjectInstance,
  refused: Status.ProcessingFailure,
};

/** One association: who called, what they asked, how it went; logged at release without patient data. */
class CrestlineScp extends Scp {
  private association: Association | undefined;
  private readonly id = `dicom-${randomBytes(4).toString('hex')}`;
  private caller = '';
  private readonly counts: Record<string, number> = {};
  /** The transfer syntax accepted for each SOP class, so answers are written in it directly (no transcoding). */
  private readonly syntaxOf = new Map<string, string>();

  private count(what: string): void {
    this.counts[what] = (this.counts[what] ?? 0) + 1;
  }

  override associationRequested(association: Association): void {
    this.association = association;
    // A worklist answer is hundreds of small PDUs: without this, Nagle's algorithm holds each
    // one back for the previous one's acknowledgement.
    (this as unknown as { socket?: { setNoDelay?: (on: boolean) => void } }).socket?.setNoDelay?.(true);
    void this.decide(association).catch((error: unknown) => {
      log.error({ association: this.id, err: { name: (error as Error)?.name, message: (error as Error)?.message } }, 'DICOM association check failed');
      this.sendAssociationReject(RejectResult.Transient, RejectSource.ServiceProviderPresentation, RejectReason.TemporaryCongestion);
    });
  }

  private async decide(association: Association): Promise<void> {
    this.caller = trimDicom(association.getCallingAeTitle());
    const called = trimDicom(association.getCalledAeTitle());
    const peer = (this as unknown as { socket?: { remoteAddress?: string } }).socket?.remoteAddress;
    if (called !== options.aeTitle) {
      log.warn({ association: this.id, caller: this.caller, called, peer }, 'DICOM association rejected: called AE title is not ours');
      this.sendAssociationReject(RejectResult.Permanent, RejectSource.ServiceUser, RejectReason.CalledAeNotRecognized);
      return;
    }
    if (!(await scannerTitles()).has(this.caller)) {
      log.warn({ association: this.id, caller: this.caller, peer }, 'DICOM association rejected: calling AE title is not a scanner in the catalog');
      this.sendAssociationReject(RejectResult.Permanent, RejectSource.ServiceUser, RejectReason.CallingAeNotRecognized);
      return;
    }
    for (const c of association.getPresentationContexts()) {
      const context = association.getPresentationContext(c.id) as PresentationContext;
      const abstract = context.getAbstractSyntaxUid();
      const offered = context.getTransferSyntaxUids();
      if (abstract === SOP.verification || abstract === SOP.worklistFind || abstract === SOP.performedStep) {
        const syntax = PLAIN_SYNTAXES.find((s) => offered.includes(s));
        if (syntax) {
          context.setResult(PresentationContextResult.Accept, syntax);
          this.syntaxOf.set(abstract, syntax);
        } else context.setResult(PresentationContextResult.RejectTransferSyntaxesNotSupported);
      } else if (STORAGE.has(abstract) && offered.length) {
        // Objects are kept as sent: the scanner's first choice of transfer syntax is taken.
        context.setResult(PresentationContextResult.Accept, offered[0]);
      } else {
        context.setResult(PresentationContextResult.RejectAbstractSyntaxNotSupported);
      }
    }
    association.setMaxPduLength(262_144);
    log.info({ association: this.id, caller: this.caller, peer }, 'DICOM association accepted');
    this.sendAssociationAccept();
  }

  override associationReleaseRequested(): void {
    log.info({ association: this.id, caller: this.caller, done: this.counts }, 'DICOM association released');
    this.sendAssociationReleaseResponse();
  }

  override abort(): void {
    log.warn({ association: this.id, caller: this.caller, done: this.counts }, 'DICOM association aborted by the caller');
  }

  override cEchoRequest(request: Parameters<InstanceType<typeof Scp>['cEchoRequest']>[0], callback: (r: InstanceType<typeof CEchoResponse>) => void): void {
    this.count('echo');
    const response = CEchoResponse.fromRequest(request);
    response.setStatus(Status.Success);
    callback(response);
  }

  override cFindRequest(request: CFindRequest, callback: (responses: Array<InstanceType<typeof CFindResponse>>) => void): void {
    // dcmjs-dimse writes two PDUs per answer; corked, the day's answers leave in a few large writes.
    const socket = (this as unknown as { socket?: { cork(): void; uncork(): void } }).socket;
    const send = (responses: Array<InstanceType<typeof CFindResponse>>) => {
      socket?.cork();
      try {
        callback(responses);
      } finally {
        socket?.uncork();
      }
    };
    void this.findWorklist(request).then(send, (error: unknown) => {
      log.error({ association: this.id, err: { name: (error as Error)?.name, message: (error as Error)?.message } }, 'worklist query failed');
      send([this.findFailure(request, Status.ProcessingFailure, 'The worklist is not available right now; try again.')]);
    });
  }

  private findFailure(request: CFindRequest, status: number, comment: string): InstanceType<typeof CFindResponse> {
    const response = CFindResponse.fromRequest(request);
    response.setStatus(status);
    response.setErrorComment(comment);
    return response;
  }

  private async findWorklist(request: CFindRequest): Promise<Array<InstanceType<typeof CFindResponse>>> {
    const started = performance.now();
    if (request.getAffectedSopClassUid() !== SOP.worklistFind) return [this.findFailure(request, Status.SopClassNotSupported, 'Only the modality worklist can be queried here.')];
    const keys = request.getDataset()?.getElements() ?? {};
    const query = readQuery(keys);
    if ('invalid' in query) return [this.findFailure(request, 0xa900, query.invalid)];
    const { timeZone } = await clinicProfile();
    const rows = await worklistRows(query, timeZone);
    const syntax = this.syntaxOf.get(SOP.worklistFind) ?? TransferSyntax.ImplicitVRLittleEndian;
    this.count('worklist-query');
    const answers = rows.map((row) => {
      const response = CFindResponse.fromRequest(request);
      response.setDataset(new EncodedDataset(requestedOnly(worklistItem(row, timeZone, options.aeTitle), keys) as EncodableDataset, syntax));
      response.setStatus(Status.Pending);
      // The command set too is written by our encoder, when dcmjs-dimse sends it (see encode.ts).
      const command = response.getCommandDataset();
      command.getDenaturalizedCommandDataset = () => encodeCommand(command.getElements() as EncodableDataset);
      return response;
    });
    const done = CFindResponse.fromRequest(request);
    done.setStatus(Status.Success);
    log.info({ association: this.id, caller: this.caller, answers: rows.length, ms: Math.round(performance.now() - started) }, 'worklist query answered');
    return [...answers, done];
  }

  override createStoreWritableStream(): Writable {
    return new RawCollector();
  }

  override createDatasetFromStoreWritableStream(writable: Writable, context: PresentationContext, callback: (dataset: InstanceType<typeof Dataset>) => void): void {
    const dataset = new Dataset({}, context.getAcceptedTransferSyntaxUid()) as RawDataset;
    dataset.raw = writable as RawCollector;
    dataset.transferSyntax = context.getAcceptedTransferSyntaxUid();
    callback(dataset);
  }

  override cStoreRequest(request: CStoreRequest, callback: (response: InstanceType<typeof CStoreResponse>) => void): void {
    const answer = (status: number, comment?: string) => {
      const response = CStoreResponse.fromRequest(request);
      response.setStatus(status);
      if (comment) response.setErrorComment(comment.slice(0, 64));
      callback(response);
    };
    const dataset = request.getDataset() as RawDataset | undefined;
    if (!dataset?.raw || !dataset.transferSyntax) return answer(0xc000, 'No data set received');
    const bytes = toPart10(
      { sopClassUid: request.getAffectedSopClassUid(), sopInstanceUid: request.getAffectedSopInstanceUid(), transferSyntaxUid: dataset.transferSyntax, sourceAeTitle: this.caller },
      dataset.raw.chunks,
    );
    void receiveObject(bytes, this.caller, this.id).then(
      (outcome: ReceiveOutcome) => {
        this.count(`store-${outcome.kind}`);
        if (outcome.kind === 'held') log.warn({ association: this.id, caller: this.caller, attachmentId: outcome.attachmentId }, 'DICOM object held for matching');
        if (outcome.kind === 'conflict' || outcome.kind === 'unreadable') {
          log.warn({ association: this.id, caller: this.caller, outcome: outcome.kind }, 'DICOM object refused');
          return answer(0xc000, outcome.message);
        }
        return answer(Status.Success);
      },
      (error: unknown) => {
        this.count('store-failed');
        log.error({ association: this.id, caller: this.caller, err: { name: (error as Error)?.name, message: (error as Error)?.message } }, 'DICOM object could not be stored');
        answer(0xa700, 'Could not store now; send again later');
      },
    );
  }

  private stepResponse<R extends InstanceType<typeof NCreateResponse> | InstanceType<typeof NSetResponse>>(response: R, answer: StepAnswer, what: string): R {
    this.count(`${what}-${answer.ok ? 'ok' : answer.refusal}`);
    if (answer.ok) {
      response.setStatus(Status.Success);
      log.info({ association: this.id, caller: this.caller, examId: answer.examId, what }, 'procedure step applied');
    } else {
      response.setStatus(dicomStatus[answer.refusal]);
      response.setErrorComment(answer.comment.slice(0, 64));
      log.warn({ association: this.id, caller: this.caller, what, refusal: answer.refusal }, 'procedure step refused');
    }
    return response;
  }

  override nCreateRequest(request: NCreateRequest, callback: (response: InstanceType<typeof NCreateResponse>) => void): void {
    const response = NCreateResponse.fromRequest(request);
    if (request.getAffectedSopClassUid() !== SOP.performedStep) {
      response.setStatus(Status.NoSuchSopClass);
      return callback(response);
    }
    const e = request.getDataset()?.getElements() ?? {};
    const status = queryText(e.PerformedProcedureStepStatus).toUpperCase();
    if (status !== 'IN PROGRESS') {
      return callback(this.stepResponse(response, { ok: false, refusal: 'invalid', comment: 'A new step must be IN PROGRESS.' }, 'step-start'));
    }
    const scheduled = first(e.ScheduledStepAttributesSequence);
    void this.instant(queryText(e.PerformedProcedureStepStartDate), queryText(e.PerformedProcedureStepStartTime))
      .then((startedAt) =>
        stepStarted(
          {
            sopInstanceUid: trimDicom(request.getAffectedSopInstanceUid() ?? ''),
            scannerAe: this.caller,
            patientId: queryText(e.PatientID),
            accessionNumber: queryText(scheduled?.AccessionNumber),
            studyInstanceUid: queryText(scheduled?.StudyInstanceUID),
            startedAt,
          },
          this.id,
        ),
      )
      .then(
        (answer) => callback(this.stepResponse(response, answer, 'step-start')),
        (error: unknown) => callback(this.stepFailed(response, error)),
      );
  }

  override nSetRequest(request: NSetRequest, callback: (response: InstanceType<typeof NSetResponse>) => void): void {
    const response = NSetResponse.fromRequest(request);
    const sopClass = request.getRequestedSopClassUid() || request.getAffectedSopClassUid();
    if (sopClass && sopClass !== SOP.performedStep) {
      response.setStatus(Status.NoSuchSopClass);
      return callback(response);
    }
    const e = request.getDataset()?.getElements() ?? {};
    const reason = first(e.PerformedProcedureStepDiscontinuationReasonCodeSequence);
    void this.instant(queryText(e.PerformedProcedureStepEndDate), queryText(e.PerformedProcedureStepEndTime))
      .then((endedAt) =>
        stepChanged(
          {
            sopInstanceUid: trimDicom(request.getRequestedSopInstanceUid() ?? ''),
            scannerAe: this.caller,
            status: queryText(e.PerformedProcedureStepStatus),
            endedAt,
            reason: reason ? queryText(reason.CodeMeaning) || queryText(reason.CodeValue) || null : null,
          },
          this.id,
        ),
      )
      .then(
        (answer) => callback(this.stepResponse(response, answer, 'step-change')),
        (error: unknown) => callback(this.stepFailed(response, error)),
      );
  }

  private stepFailed<R extends InstanceType<typeof NCreateResponse> | InstanceType<typeof NSetResponse>>(response: R, error: unknown): R {
    log.error({ association: this.id, caller: this.caller, err: { name: (error as Error)?.name, message: (error as Error)?.message } }, 'procedure step failed');
    response.setStatus(Status.ProcessingFailure);
    response.setErrorComment('Not recorded; send again later');
    return response;
  }

  /** A DICOM date and time from the scanner, in the clinic's time zone unless it says otherwise. */
  private async instant(date: string, time: string): Promise<Date | null> {
    const dt = parseDicomDateTime(date + time.replace(/:/g, ''));
    return dt ? toInstant(dt, (await clinicProfile()).timeZone) : null;
  }
}

const first = (value: unknown): Record<string, unknown> | undefined => (Array.isArray(value) ? value[0] : value ?? undefined) as Record<string, unknown> | undefined;

/** Starts the listener; resolves once it is bound. */
export async function startDicomListener(opts: ListenerOptions): Promise<{ close: () => void }> {
  options = { catalogCacheMs: 5_000, ...opts };
  db(); // registers the models before the first association asks the catalog
  dimse.log.setLevel('error');
  const server = new Server(CrestlineScp);
  server.on('networkError', (e: Error) => log.warn({ err: { name: e?.name, message: e?.message } }, 'DICOM network error'));
  // dcmjs-dimse's listen(port) binds every address (STACK.md); pass the host explicitly.
  (server.listen as unknown as (o: { port: number; host: string }) => void)({ port: opts.port, host: opts.host });
  const net = (server as unknown as { server?: import('node:net').Server }).server;
  if (net && !net.listening) {
    await new Promise<void>((resolve, reject) => {
      net.once('listening', () => resolve());
      net.once('error', reject);
    });
  }
  return { close: () => server.close() };
}
