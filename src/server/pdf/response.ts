import { dispositionName } from '../storage/send';

/**
 * A generated PDF as the answer: shown inline in the browser's viewer, never cached (it carries
 * patient data and a newer addendum changes it). No sandbox policy here: Chromium's PDF viewer
 * does not open in a sandboxed document.
 */
export function pdfResponse(file: { filename: string; bytes: Buffer }): Response {
  return new Response(new Uint8Array(file.bytes.buffer, file.bytes.byteOffset, file.bytes.byteLength) as Uint8Array<ArrayBuffer>, {
    status: 200,
    headers: {
      'Content-Type': 'application/pdf',
      'Content-Disposition': `inline; ${dispositionName(file.filename)}`,
      'Content-Length': String(file.bytes.byteLength),
      'Cache-Control': 'private, no-store',
      'X-Content-Type-Options': 'nosniff',
    },
  });
}
