import { formatBytes } from '../../lib/attachments/file-types';
import type { AttachmentDto } from '../../lib/schemas/attachments';

interface Props {
  attachments: AttachmentDto[];
  onOpen: (attachment: AttachmentDto, opener: HTMLButtonElement) => void;
}

/** What a tile says under its picture, e.g. "US · 1.2 MB" or "PNG · 340 KB". */
function caption(a: AttachmentDto): string {
  const what = a.dicom ? (a.dicom.modality || 'DICOM') : a.contentType === 'image/png' ? 'PNG' : 'JPEG';
  const frames = a.dicom?.frames && a.dicom.frames > 1 ? ` · ${a.dicom.frames} frames` : '';
  return `${what}${frames} · ${formatBytes(a.sizeBytes)}`;
}

/** A drawn stand-in for a DICOM object the server could not make a thumbnail of. */
function DicomPlaceholder() {
  return (
    <div className="flex h-full w-full flex-col items-center justify-center gap-1 bg-ink-800 text-ink-100" aria-hidden="true">
      <svg viewBox="0 0 24 24" className="h-8 w-8" fill="none" stroke="currentColor" strokeWidth="1.5">
        <path d="M4 18c2-6 5-9 8-9s6 3 8 9" />
        <path d="M12 9V4" />
        <circle cx="12" cy="4" r="1" />
      </svg>
      <span className="text-xs font-semibold tracking-wide">DICOM</span>
    </div>
  );
}

/** The exam's images as tiles; each opens the viewer. */
export function ThumbnailGrid({ attachments, onOpen }: Props) {
  return (
    <ul className="grid grid-cols-2 gap-3 sm:grid-cols-3 lg:grid-cols-5" aria-label="Images of this exam">
      {attachments.map((a) => (
        <li key={a.id}>
          <button
            type="button"
            className="group block w-full overflow-hidden rounded-md text-left ring-1 ring-ink-100 hover:ring-crest-400"
            aria-label={`Open ${a.originalName}`}
            onClick={(e) => onOpen(a, e.currentTarget)}
          >
            <span className="block aspect-[4/3] bg-ink-900">
              {a.thumbnailUrl ? (
                <img src={a.thumbnailUrl} alt="" loading="lazy" className="h-full w-full object-contain" />
              ) : (
                <DicomPlaceholder />
              )}
            </span>
            <span className="block px-2 py-1.5">
              <span className="block truncate text-xs font-medium text-ink-800" title={a.originalName}>{a.originalName}</span>
              <span className="block text-xs text-ink-500">{caption(a)}</span>
            </span>
          </button>
        </li>
      ))}
    </ul>
  );
}
