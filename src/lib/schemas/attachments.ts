import type { PixelRoute } from '../dicom/dictionary';
import type { AttachmentKind, AttachmentSource } from '../attachments/file-types';

/** One image or DICOM object of an exam, as the API returns it (no patient data beyond the exam's). */
export interface AttachmentDto {
  id: number;
  examId: number | null;
  kind: AttachmentKind;
  source: AttachmentSource;
  originalName: string;
  contentType: string;
  sizeBytes: number;
  sha256: string;
  createdAt: string;
  /** e.g. "Thu 3 Dec 2026 at 09:15", in the clinic's time zone. */
  createdLabel: string;
  uploadedBy: string | null;
  fileUrl: string;
  thumbnailUrl: string | null;
  dicom: DicomSummary | null;
}

export interface DicomSummary {
  modality: string | null;
  sopClassUid: string | null;
  sopClassName: string | null;
  acquiredAt: string | null;
  acquiredLabel: string | null;
  rows: number | null;
  columns: number | null;
  frames: number | null;
  transferSyntaxUid: string | null;
  transferSyntaxName: string | null;
  /** How the viewer can draw the first frame ('unsupported': it offers the file instead). */
  pixelRoute: PixelRoute;
}

/** The answer to an upload: the new attachment (201), or the one already there (200, duplicate). */
export interface UploadAnswer {
  attachment: AttachmentDto;
  duplicate: boolean;
}
