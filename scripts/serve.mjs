// Crestline's web server: `node scripts/serve.mjs [outDir]` (default dist) serves a build made
// with `astro build`. The app is built in the Node adapter's middleware mode, so this file owns
// the HTTP server: files of the build's client folder are answered from a list made at start-up,
// and everything else goes straight to Astro. (The adapter's standalone server first looked
// every request up on disk, an lstat and a failed stat with an error object each time, which
// cost about a tenth of the CPU of an autosave under load.) HOST and PORT come from the
// environment; SIGTERM or SIGINT closes the server and lets open requests finish.
import { createReadStream, readdirSync, statSync } from 'node:fs';
import http from 'node:http';
import path from 'node:path';
import { pathToFileURL } from 'node:url';

const outDir = path.resolve(process.argv[2] ?? 'dist');
const clientDir = path.join(outDir, 'client');

const TYPES = {
  '.js': 'text/javascript; charset=utf-8',
  '.mjs': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.svg': 'image/svg+xml',
  '.png': 'image/png',
  '.jpg': 'image/jpeg',
  '.ico': 'image/x-icon',
  '.woff': 'font/woff',
  '.woff2': 'font/woff2',
  '.ttf': 'font/ttf',
  '.txt': 'text/plain; charset=utf-8',
  '.json': 'application/json',
  '.webmanifest': 'application/manifest+json',
  '.map': 'application/json',
};

/** Every file of the client folder by its URL path, with the headers it is sent with. */
export function staticFiles(dir) {
  const files = new Map();
  const walk = (folder, prefix) => {
    for (const entry of readdirSync(folder, { withFileTypes: true })) {
      const full = path.join(folder, entry.name);
      const urlPath = `${prefix}/${entry.name}`;
      if (entry.isDirectory()) walk(full, urlPath);
      else if (entry.isFile()) {
        const st = statSync(full);
        files.set(urlPath, {
          full,
          headers: {
            'Content-Type': TYPES[path.extname(entry.name).toLowerCase()] ?? 'application/octet-stream',
            'Content-Length': String(st.size),
            ETag: `"${st.size.toString(16)}-${Math.floor(st.mtimeMs).toString(16)}"`,
            'Last-Modified': st.mtime.toUTCString(),
            // Hashed build assets never change under their name; the rest is checked hourly.
            'Cache-Control': urlPath.startsWith('/_astro/') ? 'public, max-age=31536000, immutable' : 'public, max-age=3600',
            'X-Content-Type-Options': 'nosniff',
          },
        });
      }
    }
  };
  walk(dir, '');
  return files;
}

function serveFile(req, res, file) {
  if (req.headers['if-none-match'] === file.headers.ETag) {
    res.writeHead(304, { ETag: file.headers.ETag, 'Cache-Control': file.headers['Cache-Control'] });
    return res.end();
  }
  res.writeHead(200, file.headers);
  if (req.method === 'HEAD') return res.end();
  const stream = createReadStream(file.full);
  stream.on('error', () => res.destroy());
  stream.pipe(res);
}

async function main() {
  const { handler } = await import(pathToFileURL(path.join(outDir, 'server', 'entry.mjs')).href);
  const files = staticFiles(clientDir);
  const server = http.createServer((req, res) => {
    const url = req.url ?? '/';
    let pathname;
    try {
      pathname = decodeURI(url.split(/[?#]/, 1)[0]);
    } catch {
      res.writeHead(400, { 'Content-Type': 'text/plain; charset=utf-8' });
      return res.end('Bad request.');
    }
    const file = req.method === 'GET' || req.method === 'HEAD' ? files.get(pathname) : undefined;
    if (file) return serveFile(req, res, file);
    handler(req, res);
  });
  // Kept-alive connections from a proxy or a load balancer outlive Node's 5 s default.
  server.keepAliveTimeout = 65_000;
  const host = process.env.HOST ?? '127.0.0.1';
  const port = Number(process.env.PORT ?? 4321);
  server.listen(port, host, () => console.log(`crestline web server listening on http://${host}:${port}`));
  let closing = false;
  const close = () => {
    if (closing) return;
    closing = true;
    server.close(() => process.exit(0));
    server.closeIdleConnections();
    // Requests still running after 5 s are cut off.
    setTimeout(() => process.exit(0), 5_000).unref();
  };
  process.on('SIGTERM', close);
  process.on('SIGINT', close);
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) await main();
