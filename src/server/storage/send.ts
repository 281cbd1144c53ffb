/** What a stored file needs to be sent over HTTP. */
export interface Sendable {
  body: ReadableStream<Uint8Array>;
  sizeBytes: number;
  contentType: string;
  fileName: string;
  etag: string;
}

/**
 * A file's file name for Content-Disposition: an ASCII fallback with anything unusual replaced,
 * plus the UTF-8 name (RFC 6266), so no quote, semicolon or line break reaches the header.
 *
 * @example dispositionName('Zoë "scan".png') → `filename="Zo_ _scan_.png"; filename*=UTF-8''Zo%C3%AB%20%22scan%22.png`
 */
export function dispositionName(name: string): string {
  const ascii = name.replace(/[^A-Za-z0-9 ._()-]/g, '_').slice(0, 150) || 'file';
  const utf8 = encodeURIComponent(name.slice(0, 150)).replace(/['()*]/g, (c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`);
  return `filename="${ascii}"; filename*=UTF-8''${utf8}`;
}

/**
 * Streams a stored file to staff: private caching for a few minutes (the bytes under a key never
 * change), no content sniffing, shown inline, and 304 when the browser already has it.
 */
export function sendStoredFile(file: Sendable, request: Request): Response {
  const headers = {
    'Content-Type': file.contentType,
    'Cache-Control': 'private, max-age=300',
    'X-Content-Type-Options': 'nosniff',
    'Content-Disposition': `inline; ${dispositionName(file.fileName)}`,
    // Opened on its own, the file is a document with no scripts and no origin.
    'Content-Security-Policy': 'sandbox',
    ETag: file.etag,
  };
  if (request.headers.get('if-none-match') === file.etag) {
    void file.body.cancel().catch(() => {});
    return new Response(null, { status: 304, headers });
  }
  return new Response(file.body, { status: 200, headers: { ...headers, 'Content-Length': String(file.sizeBytes) } });
}
