import { queryOptions } from '@tanstack/react-query';
import { api } from '../api-client';
import type { AttachmentDto } from '../schemas/attachments';

/** The images and DICOM objects of one exam, oldest first. */
export function attachmentsQuery(examId: number) {
  return queryOptions({
    queryKey: ['attachments', examId] as const,
    queryFn: ({ signal }) => api<{ attachments: AttachmentDto[] }>(`/api/exams/${examId}/attachments`, { signal }).then((r) => r.attachments),
  });
}
