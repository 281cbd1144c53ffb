import { useEffect, useRef, useState } from 'react';
import { ApiError } from '../../lib/api-client';
import { MAX_FILE_BYTES, SIZE_LIMITS, UPLOAD_ACCEPT, formatBytes, sizeRefusal, typeFromName } from '../../lib/attachments/file-types';
import { uploadFile } from './upload';

type State =
  | { step: 'waiting' }
  | { step: 'sending'; fraction: number }
  | { step: 'added' }
  | { step: 'duplicate' }
  | { step: 'refused'; message: string };

interface Item {
  key: number;
  file: File;
  state: State;
}

interface Props {
  examId: number;
  /** Called after each file the server accepted, so the grid can refresh. */
  onAdded: () => void;
}

/** A refusal worked out before sending: a file over every limit, or over its type's limit. */
function precheck(file: File): string | null {
  const type = typeFromName(file.name);
  if (type) return sizeRefusal(type, file.size);
  return file.size > MAX_FILE_BYTES ? sizeRefusal('dicom', file.size) : null;
}

/** Picks one or more files and sends them one after another, each with its own outcome. */
export function UploadControl({ examId, onAdded }: Props) {
  const [items, setItems] = useState<Item[]>([]);
  const nextKey = useRef(1);
  const busy = useRef(false);

  const update = (key: number, state: State) => setItems((all) => all.map((i) => (i.key === key ? { ...i, state } : i)));

  // Sends the next waiting file whenever none is in flight; one at a time keeps memory and
  // the server's work per request small, and the outcomes in order.
  useEffect(() => {
    if (busy.current) return;
    const next = items.find((i) => i.state.step === 'waiting');
    if (!next) return;
    busy.current = true;
    update(next.key, { step: 'sending', fraction: 0 });
    uploadFile(examId, next.file, (fraction) => update(next.key, { step: 'sending', fraction }))
      .then((answer) => {
        update(next.key, { step: answer.duplicate ? 'duplicate' : 'added' });
        if (!answer.duplicate) onAdded();
      })
      .catch((error: unknown) => {
        update(next.key, { step: 'refused', message: error instanceof ApiError ? error.message : 'The file could not be sent; nothing was stored.' });
      })
      .finally(() => {
        busy.current = false;
        setItems((all) => [...all]);
      });
  }, [items, examId, onAdded]);

  const pick = (files: FileList | null) => {
    if (!files?.length) return;
    const added = Array.from(files).map((file): Item => {
      const problem = precheck(file);
      return { key: nextKey.current++, file, state: problem ? { step: 'refused', message: problem } : { step: 'waiting' } };
    });
    setItems((all) => [...added, ...all]);
  };

  const sending = items.filter((i) => i.state.step === 'sending' || i.state.step === 'waiting').length;

  return (
    <div className="space-y-3">
      <div>
        <label htmlFor={`images-file-${examId}`} className="field-label">Add images</label>
        <input
          id={`images-file-${examId}`}
          type="file"
          multiple
          accept={UPLOAD_ACCEPT}
          aria-describedby={`images-file-hint-${examId}`}
          className="mt-1 block w-full text-sm text-ink-700 file:mr-3 file:cursor-pointer file:rounded-md file:border-0 file:bg-crest-600 file:px-3.5 file:py-2 file:text-sm file:font-semibold file:text-white hover:file:bg-crest-700"
          onChange={(e) => {
            pick(e.currentTarget.files);
            // Cleared so choosing the same file again is noticed.
            e.currentTarget.value = '';
          }}
        />
        <p id={`images-file-hint-${examId}`} className="mt-1 text-xs text-ink-500">
          DICOM files (.dcm) up to {formatBytes(SIZE_LIMITS.dicom)}, PNG or JPEG images up to {formatBytes(SIZE_LIMITS.png)}. DICOM files must carry this exam’s patient ID and accession number.
        </p>
      </div>
      <p role="status" className="text-sm text-ink-600">{sending > 0 ? `Uploading… ${sending} file${sending === 1 ? '' : 's'} to go.` : ''}</p>
      {items.length > 0 && (
        <ul className="space-y-1.5 text-sm" aria-label="Uploads">
          {items.map((item) => (
            <li key={item.key} className="rounded-md border border-ink-100 px-3 py-2">
              <div className="flex items-center justify-between gap-3">
                <span className="truncate font-medium text-ink-800">{item.file.name}</span>
                <Outcome state={item.state} />
              </div>
              {item.state.step === 'sending' && (
                <progress className="mt-1.5 h-1.5 w-full accent-crest-600" max={1} value={item.state.fraction} aria-label={`Uploading ${item.file.name}`} />
              )}
              {item.state.step === 'refused' && (
                <p role="alert" className="mt-1 text-sm text-high-800">{item.state.message}</p>
              )}
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}

function Outcome({ state }: { state: State }) {
  switch (state.step) {
    case 'waiting':
      return <span className="text-ink-500">Waiting</span>;
    case 'sending':
      return <span className="text-ink-600">Uploading… {Math.round(state.fraction * 100)}%</span>;
    case 'added':
      return <span className="font-semibold text-crest-700">Added</span>;
    case 'duplicate':
      return <span className="font-semibold text-dune-700">Already attached to this exam</span>;
    case 'refused':
      return <span className="font-semibold text-high-800">Not added</span>;
  }
}
