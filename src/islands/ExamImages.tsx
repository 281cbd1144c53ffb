import { QueryClientProvider, useQuery, useQueryClient } from '@tanstack/react-query';
import { useCallback, useMemo, useRef, useState } from 'react';
import { attachmentsQuery } from '../lib/queries/attachments';
import { queryClient } from '../lib/query-client';
import type { LengthField } from '../lib/report-form/length-fields';
import type { AttachmentDto } from '../lib/schemas/attachments';
import { ImageViewer } from './images/ImageViewer';
import { ThumbnailGrid } from './images/ThumbnailGrid';
import { UploadControl } from './images/UploadControl';

interface Props {
  examId: number;
  /** Shows the upload control; the server still checks the role and the exam's status. */
  canUpload: boolean;
  /** Report fields a length measured on an image may be put into; only where the report form is open. */
  lengthFields?: LengthField[];
}

/** The images of one exam: thumbnails, a viewer, and (for sonographers and the manager) uploads. */
function Images({ examId, canUpload, lengthFields }: Props) {
  const client = useQueryClient();
  const query = useMemo(() => attachmentsQuery(examId), [examId]);
  const { data, isPending, isError, error } = useQuery(query);
  const [open, setOpen] = useState<AttachmentDto | null>(null);
  const opener = useRef<HTMLButtonElement | null>(null);
  const refresh = useCallback(() => void client.invalidateQueries({ queryKey: query.queryKey }), [client, query.queryKey]);

  return (
    <div className="space-y-5">
      {canUpload && <UploadControl examId={examId} onAdded={refresh} />}
      {isPending && <p className="text-sm text-ink-500">Loading images…</p>}
      {isError && <p role="alert" className="text-sm text-high-800">{error.message}</p>}
      {data && data.length === 0 && (
        <p className="text-sm text-ink-500">No images yet.{canUpload ? ' Add DICOM files from the scanner, or PNG and JPEG exports.' : ''}</p>
      )}
      {data && data.length > 0 && (
        <ThumbnailGrid
          attachments={data}
          onOpen={(a, button) => {
            opener.current = button;
            setOpen(a);
          }}
        />
      )}
      {open && (
        <ImageViewer
          key={open.id}
          attachment={open}
          lengthFields={lengthFields}
          onClose={() => {
            setOpen(null);
            opener.current?.focus();
          }}
        />
      )}
    </div>
  );
}

export default function ExamImages(props: Props) {
  return (
    <QueryClientProvider client={queryClient}>
      <Images {...props} />
    </QueryClientProvider>
  );
}
