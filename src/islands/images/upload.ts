import { ApiError } from '../../lib/api-client';
import type { UploadAnswer } from '../../lib/schemas/attachments';

/**
 * Sends one file as multipart/form-data. XMLHttpRequest rather than fetch: only it reports
 * upload progress. Resolves with the server's answer; rejects with ApiError carrying its message.
 */
export function uploadFile(examId: number, file: File, onProgress: (fraction: number) => void, signal?: AbortSignal): Promise<UploadAnswer> {
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', `/api/exams/${examId}/attachments`);
    xhr.setRequestHeader('Accept', 'application/json');
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) onProgress(e.loaded / e.total);
    };
    xhr.onload = () => {
      let data: unknown;
      try {
        data = JSON.parse(xhr.responseText);
      } catch {
        data = undefined;
      }
      if (xhr.status >= 200 && xhr.status < 300 && data) return resolve(data as UploadAnswer);
      const err = (data as { error?: { code?: string; message?: string; fields?: Record<string, string> } })?.error;
      reject(new ApiError(xhr.status, err?.code ?? `HTTP_${xhr.status}`, err?.message ?? `The server answered ${xhr.status}; nothing was stored.`, err?.fields));
    };
    xhr.onerror = () => reject(new ApiError(0, 'NETWORK', 'Crestline could not be reached. Check the connection and try again.'));
    xhr.onabort = () => reject(new DOMException('Upload cancelled', 'AbortError'));
    signal?.addEventListener('abort', () => xhr.abort(), { once: true });
    const form = new FormData();
    form.append('file', file, file.name);
    xhr.send(form);
  });
}
