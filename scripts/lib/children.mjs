// Every long-running process the start and test scripts spawn, so that a Ctrl-C at any
// moment (even half-way through start-up) stops all of them, newest first.
const running = [];
let stopping = false;

/** Registers a spawned child; `graceMs` is how long it gets after SIGTERM before SIGKILL. */
export function track(child, graceMs = 10_000) {
  const entry = { child, graceMs, exited: child.exitCode !== null };
  child.once('exit', () => {
    entry.exited = true;
  });
  running.push(entry);
  // Spawned after a stop began (a start-up step racing the Ctrl-C): stop it at once.
  if (stopping) void stopChild(entry);
  return entry;
}

/** Stops one tracked child and waits for it to exit. */
export function stopChild(entry) {
  return new Promise((resolve) => {
    if (entry.exited) return resolve();
    entry.child.once('exit', () => resolve());
    entry.child.kill('SIGTERM');
    setTimeout(() => !entry.exited && entry.child.kill('SIGKILL'), entry.graceMs).unref();
  });
}

/** Stops every tracked child, newest first. */
export async function stopAll() {
  stopping = true;
  while (running.length) await stopChild(running.pop());
}
