import { useCallback, useEffect, useRef, useState } from 'react';
import { formatBytes } from '../../lib/attachments/file-types';
import type { AttachmentDto } from '../../lib/schemas/attachments';
import { DicomCanvas } from './DicomCanvas';
import type { Drawn } from './render-dicom';

interface Props {
  attachment: AttachmentDto;
  onClose: () => void;
}

/**
 * A modal dialog showing one image: PNG and JPEG as they are, DICOM drawn in a canvas. The
 * native <dialog> keeps focus inside, closes on Escape, and the opener gets focus back.
 */
export function ImageViewer({ attachment: a, onClose }: Props) {
  const dialog = useRef<HTMLDialogElement>(null);
  const [drawn, setDrawn] = useState<Drawn | null>(null);
  const onDrawn = useCallback((d: Drawn) => setDrawn(d), []);
  const titleId = `image-viewer-title-${a.id}`;

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
      className="m-auto w-[min(96vw,72rem)] max-w-none rounded-card bg-white p-0 shadow-card backdrop:bg-ink-900/70"
    >
      <div className="flex items-center justify-between gap-4 border-b border-ink-100 px-5 py-3">
        <h2 id={titleId} className="truncate text-base font-semibold text-ink-900">{a.originalName}</h2>
        <button type="button" className="btn-quiet" onClick={() => dialog.current?.close()} autoFocus>Close</button>
      </div>
      <div className="grid gap-0 md:grid-cols-[1fr_16rem]">
        <div className="flex min-h-[40vh] items-center justify-center bg-ink-900">
          {d ? (
            <DicomCanvas attachment={a} onDrawn={onDrawn} />
          ) : (
            <img src={a.fileUrl} alt={a.originalName} className="block max-h-[70vh] w-full object-contain" />
          )}
        </div>
        <dl className="space-y-2 p-5 text-sm">
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
    </dialog>
  );
}
