import net from 'node:net';

/** True when nothing listens on host:port. */
export function portFree(port, host = '127.0.0.1') {
  return new Promise((resolve) => {
    const server = net.createServer();
    server.once('error', () => resolve(false));
    server.listen({ port, host, exclusive: true }, () => server.close(() => resolve(true)));
  });
}

/** A port the OS says is free right now. */
export function freePort(host = '127.0.0.1') {
  return new Promise((resolve, reject) => {
    const server = net.createServer();
    server.once('error', reject);
    server.listen({ port: 0, host }, () => {
      const { port } = server.address();
      server.close(() => resolve(port));
    });
  });
}

/** Polls a URL until it answers 200, the process dies, or the time runs out. */
export async function waitForHttp(url, { timeoutMs = 30_000, alive = () => true } = {}) {
  const until = Date.now() + timeoutMs;
  while (Date.now() < until) {
    if (!alive()) return 'died';
    try {
      const res = await fetch(url, { signal: AbortSignal.timeout(2_000) });
      if (res.ok) return 'up';
    } catch {
      // not yet listening
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  return 'timeout';
}

/** Polls until something accepts TCP connections on host:port, the process dies, or the time runs out. */
export async function waitForTcp(host, port, { timeoutMs = 30_000, alive = () => true } = {}) {
  const until = Date.now() + timeoutMs;
  while (Date.now() < until) {
    if (!alive()) return 'died';
    const up = await new Promise((resolve) => {
      const socket = net.connect({ host, port });
      socket.once('connect', () => {
        socket.destroy();
        resolve(true);
      });
      socket.once('error', () => resolve(false));
    });
    if (up) return 'up';
    await new Promise((r) => setTimeout(r, 200));
  }
  return 'timeout';
}
