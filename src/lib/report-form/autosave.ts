// Debounced, serialised autosave with optimistic locking. Framework-free so the rules
// (never two saves in flight, the newest entries win, a stale save stops and asks) are
// unit-tested with fake timers.

/** What a failed save tells the form (an ApiError from src/lib/api-client fits). */
export interface SaveFailure {
  status: number;
  code?: string;
  message: string;
  fields?: Record<string, string>;
  details?: Record<string, unknown>;
}

export type SavePhase =
  | 'idle' // nothing typed since the page opened
  | 'pending' // typed, waiting for the pause
  | 'saving'
  | 'saved'
  | 'invalid' // the server refused a value (400)
  | 'conflict' // someone saved a newer version (409 STALE): waits for the user's choice
  | 'error' // network, session or server trouble: retried
  | 'closed'; // the report can no longer be edited here (submitted, or not a draft)

export interface SaveStatus<C> {
  phase: SavePhase;
  /** When the last save succeeded. */
  savedAt: Date | null;
  /** Why the last save failed, for "Not saved: …". */
  reason: string | null;
  /** Field errors of a 400, keyed as the server sent them. */
  fields: Record<string, string>;
  /** The newer report a 409 carried. */
  current: C | null;
  /** The snapshot the failed or refused save sent (to re-key its field errors). */
  sent: unknown;
}

export interface AutosaverOptions<P, R, C> {
  version: number;
  /** Pause after the last change before saving, ms. */
  delayMs?: number;
  /** First retry after a network or server error, ms (doubles up to 30 s). */
  retryMs?: number;
  /** The newest entries, read at save time, so a queued save always sends the latest. */
  snapshot: () => P;
  send: (snapshot: P, version: number) => Promise<R>;
  versionOf: (response: R) => number;
  /** The newer report carried by a 409, if any. */
  currentOf?: (failure: SaveFailure) => C | null;
  onStatus: (status: SaveStatus<C>) => void;
  onSaved?: (response: R, snapshot: P) => void;
  now?: () => Date;
}

export interface Autosaver<C> {
  /** Something changed: save after the pause (the pause restarts with each change). */
  schedule(): void;
  /** Save now if anything is unsaved and wait until no save is running; true when all is saved. */
  flush(): Promise<boolean>;
  /** After a conflict: save the form's entries over the newer version (its `version`). */
  keepMine(currentVersion: number): Promise<boolean>;
  /** After a conflict: the form now shows the newer version, which is already saved. */
  adopt(version: number): void;
  /** Another request (e.g. submit) met a newer version: hold saving until the user chooses. */
  conflict(current: C | null): void;
  /** The report can no longer be edited here: stop saving. */
  close(reason: string): void;
  readonly version: number;
  readonly dirty: boolean;
  readonly status: SaveStatus<C>;
  dispose(): void;
}

const MAX_RETRY_MS = 30_000;

/** Plain words for a failed save, e.g. "Crestline could not be reached…". */
function reasonOf(f: SaveFailure): string {
  if (f.status === 401) return 'your session has ended. Sign in again in a new tab; this page keeps your entries.';
  if (f.status === 400) return `${Object.keys(f.fields ?? {}).length || 'some'} value(s) need correcting.`;
  return f.message;
}

/**
 * @example
 * const saver = createAutosaver({ version: report.version, snapshot: () => body, send: (b, version) => api(url, { method: 'PUT', body: { ...b, version } }), versionOf: (r) => r.report.version, onStatus: setStatus });
 * input.addEventListener('input', () => saver.schedule());
 */
export function createAutosaver<P, R, C = unknown>(opts: AutosaverOptions<P, R, C>): Autosaver<C> {
  const delayMs = opts.delayMs ?? 800;
  const now = opts.now ?? (() => new Date());
  let version = opts.version;
  let dirty = false;
  let inFlight: Promise<void> | null = null;
  let timer: ReturnType<typeof setTimeout> | null = null;
  let retryMs = opts.retryMs ?? 2_000;
  let disposed = false;
  let status: SaveStatus<C> = { phase: 'idle', savedAt: null, reason: null, fields: {}, current: null, sent: null };

  const set = (patch: Partial<SaveStatus<C>>) => {
    status = { ...status, ...patch };
    if (!disposed) opts.onStatus(status);
  };
  const clearTimer = () => {
    if (timer !== null) clearTimeout(timer);
    timer = null;
  };
  const stopped = () => status.phase === 'conflict' || status.phase === 'closed' || disposed;

  const fail = (f: SaveFailure, sent: P) => {
    dirty = true;
    if (f.status === 409 && f.code === 'STALE') {
      set({ phase: 'conflict', reason: 'someone else saved a newer version.', current: opts.currentOf?.(f) ?? null, fields: {}, sent });
    } else if (f.status === 409 || f.status === 403 || f.status === 404) {
      set({ phase: 'closed', reason: f.message, fields: {}, sent });
    } else if (f.status === 400 || f.status === 422) {
      // The same entries would be refused again: wait for the next change.
      set({ phase: 'invalid', reason: reasonOf(f), fields: f.fields ?? {}, sent });
    } else {
      set({ phase: 'error', reason: reasonOf(f), fields: {}, sent });
      if (f.status !== 401) {
        clearTimer();
        timer = setTimeout(() => void run(), retryMs);
        retryMs = Math.min(retryMs * 2, MAX_RETRY_MS);
      }
    }
  };

  // One save at a time: a change during a save marks the form dirty, and the save that
  // finishes starts the next one with whatever the form holds then.
  function run(): Promise<void> {
    clearTimer();
    if (inFlight !== null) return inFlight;
    if (!dirty || stopped()) return Promise.resolve();
    dirty = false;
    const sent = opts.snapshot();
    set({ phase: 'saving' });
    inFlight = opts
      .send(sent, version)
      .then(
        (response) => {
          version = opts.versionOf(response);
          retryMs = opts.retryMs ?? 2_000;
          set({ phase: dirty ? 'pending' : 'saved', savedAt: now(), reason: null, fields: {}, current: null, sent: null });
          opts.onSaved?.(response, sent);
        },
        (error: unknown) => {
          const f = error as Partial<SaveFailure>;
          fail({ status: typeof f.status === 'number' ? f.status : 0, code: f.code, message: f.message ?? 'the save failed.', fields: f.fields, details: f.details }, sent);
        },
      )
      .finally(() => {
        inFlight = null;
        if (dirty && (status.phase === 'pending' || status.phase === 'saved') && timer === null) timer = setTimeout(() => void run(), 0);
      });
    return inFlight;
  }

  return {
    schedule() {
      dirty = true;
      if (stopped()) return;
      if (status.phase !== 'saving' && status.phase !== 'error') set({ phase: 'pending' });
      clearTimer();
      timer = setTimeout(() => void run(), delayMs);
    },
    async flush() {
      clearTimer();
      let attempted = false;
      for (;;) {
        if (inFlight !== null) {
          await inFlight;
          continue;
        }
        // One attempt of our own: a refused or failed save would fail the same way again.
        if (!dirty || stopped() || attempted) break;
        attempted = true;
        await run();
      }
      return !dirty && !stopped();
    },
    keepMine(currentVersion: number) {
      if (status.phase !== 'conflict') return this.flush();
      version = currentVersion;
      dirty = true;
      set({ phase: 'pending', current: null, reason: null });
      return this.flush();
    },
    adopt(newVersion: number) {
      clearTimer();
      version = newVersion;
      dirty = false;
      set({ phase: 'saved', savedAt: now(), current: null, reason: null, fields: {}, sent: null });
    },
    conflict(current: C | null) {
      clearTimer();
      dirty = true;
      set({ phase: 'conflict', reason: 'someone else saved a newer version.', current });
    },
    close(reason: string) {
      clearTimer();
      set({ phase: 'closed', reason });
    },
    get version() {
      return version;
    },
    get dirty() {
      return dirty;
    },
    get status() {
      return status;
    },
    dispose() {
      disposed = true;
      clearTimer();
    },
  };
}
