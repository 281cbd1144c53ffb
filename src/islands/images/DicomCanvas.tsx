import { useEffect, useRef, useState } from 'react';
import type { AttachmentDto } from '../../lib/schemas/attachments';
import type { Drawn } from './render-dicom';

type Phase = { at: 'loading' } | { at: 'drawn'; drawn: Drawn } | { at: 'failed'; message: string };

/** Fetches a DICOM file and draws its first frame in a canvas, in the browser. */
export function DicomCanvas({ attachment, onDrawn }: { attachment: AttachmentDto; onDrawn: (drawn: Drawn) => void }) {
  const canvas = useRef<HTMLCanvasElement>(null);
  const [phase, setPhase] = useState<Phase>({ at: 'loading' });
  const route = attachment.dicom?.pixelRoute ?? 'unsupported';

  useEffect(() => {
    if (route === 'unsupported') return;
    const abort = new AbortController();
    (async () => {
      const res = await fetch(attachment.fileUrl, { credentials: 'same-origin', signal: abort.signal });
      if (!res.ok) throw new Error(`The server answered ${res.status}.`);
      const buffer = await res.arrayBuffer();
      const { drawDicom } = await import('./render-dicom');
      if (abort.signal.aborted || !canvas.current) return;
      const drawn = await drawDicom(buffer, route, canvas.current);
      setPhase({ at: 'drawn', drawn });
      onDrawn(drawn);
    })().catch((error: unknown) => {
      if ((error as Error)?.name === 'AbortError') return;
      setPhase({ at: 'failed', message: 'This DICOM image could not be drawn in the browser. Download the file to open it in a DICOM workstation.' });
    });
    return () => abort.abort();
  }, [attachment.fileUrl, route, onDrawn]);

  if (route === 'unsupported') {
    const why = attachment.dicom?.rows ? `its pixel data is compressed as ${attachment.dicom.transferSyntaxName ?? 'an unknown transfer syntax'}` : 'it holds no image';
    return (
      <p className="max-w-md p-6 text-center text-sm text-ink-100">
        The browser viewer cannot draw this DICOM object: {why}. <a className="font-semibold underline" href={attachment.fileUrl} download={attachment.originalName}>Download the file</a> to open it in a DICOM workstation.
      </p>
    );
  }
  const size = phase.at === 'drawn' ? phase.drawn : null;
  return (
    <>
      {phase.at === 'loading' && <p role="status" className="p-6 text-sm text-ink-100">Loading the DICOM image…</p>}
      {phase.at === 'failed' && <p role="alert" className="max-w-md p-6 text-center text-sm text-high-200">{phase.message}</p>}
      <canvas
        ref={canvas}
        role="img"
        aria-label={`${attachment.originalName}, first frame`}
        className={phase.at === 'drawn' ? 'block max-h-[70vh] w-full object-contain' : 'hidden'}
        style={size ? { aspectRatio: `${size.width} / ${size.height}` } : undefined}
      />
    </>
  );
}
