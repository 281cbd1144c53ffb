import { useCallback, useEffect, useId, useRef, useState } from 'react';
import { formatBytes } from '../../lib/attachments/file-types';
import { formatQuantity } from '../../lib/clinical/formatting';
import { caliperLength, type CaliperResult } from '../../lib/dicom/calibration';
import { listen, putValue, VALUE_TAKEN_EVENT, type ValueTakenDetail } from '../../lib/report-form/external-values';
import { lengthForField, type LengthField } from '../../lib/report-form/length-fields';
import type { AttachmentDto } from '../../lib/schemas/attachments';
import { DicomCanvas, type CaliperLine } from './DicomCanvas';
import type { Drawn } from './render-dicom';

interface Props {
  attachment: AttachmentDto;
  onClose: () => void;
  /** Report fields a measured length may be put into; absent where no report form is open. */
  lengthFields?: LengthField[];
}

/**
 * A modal dialog showing one image: PNG and JPEG as they are, DICOM drawn in a canvas. The
 * native <dialog> keeps focus inside, closes on Escape, and the opener gets focus back.
 */
export function ImageViewer({ attachment: a, onClose, lengthFields }: Props) {
  const dialog = useRef<HTMLDialogElement>(null);
  const [drawn, setDrawn] = useState<Drawn | null>(null);
  const onDrawn = useCallback((d: Drawn) => setDrawn(d), []);
  const [measuring, setMeasuring] = useState(false);
  const [line, setLine] = useState<CaliperLine | null>(null);
  const titleId = `image-viewer-title-${a.id}`;
  const measurable = drawn?.regions.some((r) => r.kind === 'length') ?? false;
  const result = drawn && line ? caliperLength(drawn.regions, line.a, line.b) : null;

  useEffect(() => {
    const el = dialog.current;
    if (el && !el.open) el.showModal();
    return () => el?.close();
  }, []);

  const d = a.dicom;
  const facts: Array<[string, string]> = d
    ? [
        ['Modality', d.modality || '—'],
        ['Acquired', d.acquiredLabel ?? 'Not recorded in the file'],
        ['Image type', d.sopClassName ?? d.sopClassUid ?? '—'],
        ['Size', d.rows && d.columns ? `${d.columns} × ${d.rows} pixels${d.frames && d.frames > 1 ? `, ${d.frames} frames (first shown)` : ''}` : '—'],
        ['Encoding', d.transferSyntaxName ?? '—'],
        ...(drawn?.windowLevel ? [['Display', drawn.windowLevel] as [string, string]] : []),
      ]
    : [];
  facts.push(['File', `${formatBytes(a.sizeBytes)}${a.uploadedBy ? `, added by ${a.uploadedBy}` : ''} on ${a.createdLabel}`]);

  return (
    <dialog
      ref={dialog}
      aria-labelledby={titleId}
      onClose={onClose}
      onKeyDown={(e) => {
        // Escape clears a caliper line first; with none drawn it closes the viewer as usual.
        if (e.key === 'Escape' && line) {
          e.preventDefault();
          setLine(null);
        }
      }}
      className="m-auto w-[min(96vw,72rem)] max-w-none rounded-card bg-white p-0 shadow-card backdrop:bg-ink-900/70"
    >
      <div className="flex items-center justify-between gap-4 border-b border-ink-100 px-5 py-3">
        <h2 id={titleId} className="truncate text-base font-semibold text-ink-900">{a.originalName}</h2>
        <button type="button" className="btn-quiet" onClick={() => dialog.current?.close()} autoFocus>Close</button>
      </div>
      <div className="grid gap-0 md:grid-cols-[1fr_16rem]">
        <div className="flex min-h-[40vh] items-center justify-center bg-ink-900">
          {d ? (
            <DicomCanvas attachment={a} onDrawn={onDrawn} calipers={measurable ? { on: measuring, line, onLine: setLine } : undefined} />
          ) : (
            <img src={a.fileUrl} alt={a.originalName} className="block max-h-[70vh] w-full object-contain" />
          )}
        </div>
        <div className="space-y-5 p-5">
          {d && drawn && (
            <MeasurePanel measurable={measurable} measuring={measuring} onToggle={() => setMeasuring((on) => !on)} result={result} lengthFields={lengthFields} />
          )}
          <dl className="space-y-2 text-sm">
            {facts.map(([term, value]) => (
              <div key={term}>
                <dt className="text-ink-500">{term}</dt>
                <dd className="text-ink-800">{value}</dd>
              </div>
            ))}
            <div className="pt-2">
              <a className="font-medium text-crest-700 hover:underline" href={a.fileUrl} download={a.originalName}>Download the original file</a>
            </div>
          </dl>
        </div>
      </div>
    </dialog>
  );
}

interface MeasureProps {
  measurable: boolean;
  measuring: boolean;
  onToggle: () => void;
  result: CaliperResult | null;
  lengthFields: LengthField[] | undefined;
}

/** The Measure switch, the length of the line (or why there is none), and where it may go. */
function MeasurePanel({ measurable, measuring, onToggle, result, lengthFields }: MeasureProps) {
  const headingId = useId();
  return (
    <section aria-labelledby={headingId} className="space-y-3 border-b border-ink-100 pb-5 text-sm">
      <h3 id={headingId} className="font-semibold text-ink-800">Length</h3>
      {!measurable ? (
        <p className="text-ink-600">This image carries no length calibration, so lengths cannot be measured on it.</p>
      ) : (
        <>
          <div className="flex items-center gap-3">
            <button
              type="button"
              className="btn-quiet aria-pressed:bg-crest-100 aria-pressed:text-crest-800 aria-pressed:ring-crest-300"
              aria-pressed={measuring}
              onClick={onToggle}
            >
              Measure
            </button>
            <span className="text-xs text-ink-500">{measuring ? 'Drag across the image. Escape clears the line.' : 'Turn on, then drag across the image.'}</span>
          </div>
          <p aria-live="polite" className={result?.ok ? 'text-base font-semibold text-ink-900' : 'text-ink-700'}>
            {result === null ? '' : result.ok ? `Length ${formatQuantity(result.mm, 'mm', 1)}` : result.reason}
          </p>
          {lengthFields && lengthFields.length > 0 && <PutIntoForm lengthMm={result?.ok ? result.mm : null} fields={lengthFields} />}
        </>
      )}
    </section>
  );
}

type Answer = { state: 'waiting' | 'taken' | 'refused'; message: string };

/** Waiting this long for the form's answer; none means no form on the page took the value. */
const ANSWER_WAIT_MS = 3000;

/**
 * Puts the measured length into a chosen field of the report form (another island) through
 * a window event, and shows what the form answered.
 */
function PutIntoForm({ lengthMm, fields }: { lengthMm: number | null; fields: readonly LengthField[] }) {
  const selectId = useId();
  const [code, setCode] = useState(fields[0]!.code);
  const [answer, setAnswer] = useState<Answer | null>(null);
  // The code awaiting an answer; a ref because the form may answer within putValue itself.
  const pending = useRef<string | null>(null);
  const field = fields.find((f) => f.code === code) ?? fields[0]!;
  const value = lengthMm === null ? null : lengthForField(lengthMm, field);
  const valueText = value === null ? null : field.decimals === undefined ? `${value} ${field.unit}` : formatQuantity(value, field.unit, field.decimals);

  useEffect(
    () =>
      listen<ValueTakenDetail>(VALUE_TAKEN_EVENT, (detail) => {
        if (detail.code !== pending.current) return;
        pending.current = null;
        setAnswer({ state: detail.ok ? 'taken' : 'refused', message: detail.message });
      }),
    [],
  );
  useEffect(() => {
    if (answer?.state !== 'waiting') return;
    const timer = window.setTimeout(() => {
      pending.current = null;
      setAnswer({ state: 'refused', message: 'The report form did not answer, so nothing was put in. Type the value into the field instead.' });
    }, ANSWER_WAIT_MS);
    return () => window.clearTimeout(timer);
  }, [answer]);

  const put = () => {
    if (value === null) return;
    pending.current = field.code;
    setAnswer({ state: 'waiting', message: `Putting ${valueText} into ${field.label}…` });
    putValue({ code: field.code, value, source: 'image' });
  };

  return (
    <div className="space-y-2">
      <div>
        <label htmlFor={selectId} className="field-label">Report field</label>
        <select id={selectId} className="field-input" value={code} onChange={(e) => setCode(e.currentTarget.value)}>
          {sectionGroups(fields).map((g, i) =>
            g.section ? (
              <optgroup key={`${i}-${g.section}`} label={g.section}>
                {g.fields.map((f) => <option key={f.code} value={f.code}>{f.label} ({f.unit})</option>)}
              </optgroup>
            ) : (
              g.fields.map((f) => <option key={f.code} value={f.code}>{f.label} ({f.unit})</option>)
            ),
          )}
        </select>
        <p className="mt-1 text-xs text-ink-500">{valueText ? `Puts ${valueText}, marked as measured on the image.` : 'Draw a line in a calibrated part of the image first.'}</p>
      </div>
      <button type="button" className="btn-primary" disabled={value === null} onClick={put}>Put into form</button>
      <p role="status" className={answer?.state === 'refused' ? 'text-high-800' : answer?.state === 'taken' ? 'text-crest-700' : 'text-ink-600'}>
        {answer?.message ?? ''}
      </p>
    </div>
  );
}

/** Consecutive fields of one section together, in the given order. */
function sectionGroups(fields: readonly LengthField[]): Array<{ section: string | undefined; fields: LengthField[] }> {
  const groups: Array<{ section: string | undefined; fields: LengthField[] }> = [];
  for (const f of fields) {
    const last = groups.at(-1);
    if (last && last.section === f.section) last.fields.push(f);
    else groups.push({ section: f.section, fields: [f] });
  }
  return groups;
}
