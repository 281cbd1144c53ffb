/** The error an endpoint answered with, in the one error shape. */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly fields: Record<string, string> = {},
    /** Everything else the error object carried (e.g. `current` of a stale save). */
    readonly details: Record<string, unknown> = {},
  ) {
    super(message);
    this.name = 'ApiError';
  }
}

/**
 * fetch() for our JSON endpoints: sends JSON, parses the answer, and throws ApiError with the
 * server's message and field errors on any non-2xx status.
 *
 * @example const { rows } = await api<{ rows: UserRow[] }>('/api/users?page=1');
 */
export async function api<T>(url: string, init: { method?: string; body?: unknown; signal?: AbortSignal } = {}): Promise<T> {
  let res: Response;
  try {
    res = await fetch(url, {
      method: init.method ?? 'GET',
      credentials: 'same-origin',
      signal: init.signal,
      headers: init.body !== undefined ? { 'Content-Type': 'application/json', Accept: 'application/json' } : { Accept: 'application/json' },
      body: init.body !== undefined ? JSON.stringify(init.body) : undefined,
    });
  } catch (error) {
    if ((error as Error).name === 'AbortError') throw error;
    throw new ApiError(0, 'NETWORK', 'Crestline could not be reached. Check the connection and try again.');
  }
  const text = await res.text();
  let data: unknown = undefined;
  try {
    data = text ? JSON.parse(text) : undefined;
  } catch {
    // fall through: a non-JSON answer is reported below
  }
  if (!res.ok) {
    const err = (data as { error?: { code?: string; message?: string; fields?: Record<string, string> } & Record<string, unknown> })?.error;
    if (res.status === 401) {
      throw new ApiError(401, 'UNAUTHENTICATED', err?.message ?? 'Your session has ended. Please sign in again.');
    }
    throw new ApiError(res.status, err?.code ?? 'HTTP_' + res.status, err?.message ?? `The server answered ${res.status}.`, err?.fields, err ?? {});
  }
  return data as T;
}

/** Builds a query string from defined values only. */
export function qs(params: Record<string, string | number | boolean | undefined | null>): string {
  const search = new URLSearchParams();
  for (const [k, v] of Object.entries(params)) if (v !== undefined && v !== null && v !== '') search.set(k, String(v));
  const s = search.toString();
  return s ? `?${s}` : '';
}
