import { useEffect, useRef, useState, type PointerEvent } from 'react';
import type { ImagePoint } from '../../lib/dicom/calibration';
import { pointInContainedImage } from '../../lib/dicom/view-geometry';
import type { AttachmentDto } from '../../lib/schemas/attachments';
import type { Drawn } from './render-dicom';

type Phase = { at: 'loading' } | { at: 'drawn'; drawn: Drawn } | { at: 'failed'; message: string };

/** A caliper line, its ends in image pixel coordinates. */
export interface CaliperLine {
  a: ImagePoint;
  b: ImagePoint;
}

/** The calipers: whether dragging draws a line, the finished line, and where a new one goes. */
export interface Calipers {
  on: boolean;
  line: CaliperLine | null;
  onLine: (line: CaliperLine | null) => void;
}

interface Props {
  attachment: AttachmentDto;
  onDrawn: (drawn: Drawn) => void;
  calipers?: Calipers;
}

/** Fetches a DICOM file and draws its first frame in a canvas, in the browser; calipers draw over it. */
export function DicomCanvas({ attachment, onDrawn, calipers }: Props) {
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
      {/* The overlay covers exactly the canvas box; the image's own pixels are never drawn on. */}
      <div className={phase.at === 'drawn' ? 'relative w-full' : 'hidden'}>
        <canvas
          ref={canvas}
          role="img"
          aria-label={`${attachment.originalName}, first frame`}
          className="block max-h-[70vh] w-full object-contain"
          style={size ? { aspectRatio: `${size.width} / ${size.height}` } : undefined}
        />
        {size && calipers && <CaliperOverlay image={size} calipers={calipers} />}
      </div>
    </>
  );
}

/**
 * An SVG over the canvas, in image pixel units (viewBox) and letterboxed as the canvas is
 * (xMidYMid meet = object-fit: contain), so a line drawn here lies on the pixels it names.
 */
function CaliperOverlay({ image, calipers }: { image: { width: number; height: number }; calipers: Calipers }) {
  // The line being dragged stays here; the viewer hears of it once, when it is let go, so the
  // spoken result is not repeated at every pointer move. The start is a ref: pointer events
  // can come faster than renders.
  const [draft, setDraft] = useState<CaliperLine | null>(null);
  const start = useRef<ImagePoint | null>(null);
  const toImage = (e: PointerEvent<SVGSVGElement>) => pointInContainedImage(e.currentTarget.getBoundingClientRect(), image, { x: e.clientX, y: e.clientY });

  const down = (e: PointerEvent<SVGSVGElement>) => {
    if (!calipers.on || e.button !== 0) return;
    e.currentTarget.setPointerCapture(e.pointerId);
    const p = toImage(e);
    start.current = p;
    setDraft({ a: p, b: p });
  };
  const move = (e: PointerEvent<SVGSVGElement>) => {
    if (start.current) setDraft({ a: start.current, b: toImage(e) });
  };
  const up = (e: PointerEvent<SVGSVGElement>) => {
    if (!start.current) return;
    const line = { a: start.current, b: toImage(e) };
    start.current = null;
    setDraft(null);
    // A click without a drag (under one image pixel) draws nothing and clears the old line.
    calipers.onLine(Math.hypot(line.b.x - line.a.x, line.b.y - line.a.y) < 1 ? null : line);
  };
  const cancel = () => {
    start.current = null;
    setDraft(null);
  };

  const shown = draft ?? calipers.line;
  const dot = Math.max(image.width, image.height) / 180;
  return (
    <svg
      aria-hidden="true"
      viewBox={`0 0 ${image.width} ${image.height}`}
      preserveAspectRatio="xMidYMid meet"
      className={`absolute inset-0 h-full w-full text-dune-300 ${calipers.on ? 'cursor-crosshair touch-none' : 'pointer-events-none'}`}
      onPointerDown={down}
      onPointerMove={move}
      onPointerUp={up}
      onPointerCancel={cancel}
    >
      {shown && (
        <g stroke="currentColor" fill="none" strokeWidth={2}>
          <line x1={shown.a.x} y1={shown.a.y} x2={shown.b.x} y2={shown.b.y} vectorEffect="non-scaling-stroke" />
          <circle cx={shown.a.x} cy={shown.a.y} r={dot} vectorEffect="non-scaling-stroke" />
          <circle cx={shown.b.x} cy={shown.b.y} r={dot} vectorEffect="non-scaling-stroke" />
        </g>
      )}
    </svg>
  );
}
