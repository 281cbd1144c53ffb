import type { WorklistQuery, WorklistRow } from '../../lib/schemas/exams';
import { worklist } from './worklist';

type Page = { rows: WorklistRow[]; total: number };
/** The answer as sent: serialized once per cache entry, not once per request. */
export type PageJson = string;

/**
 * Every open worklist polls every few seconds, mostly with the same filters. Answers are kept
 * for a short time (WORKLIST_CACHE_MS, default 1.5 s; 0 turns it off) and identical requests
 * in flight share one query. Any change to an exam made through this process clears the cache
 * at once (examsChanged); a change made by another process shows within that time.
 */
const TTL_MS = Number(process.env.WORKLIST_CACHE_MS ?? 1500);
const MAX_ENTRIES = 500;
const entries = new Map<string, { at: number; page: Promise<PageJson> }>();

/** Call after any use-case that changed an exam's time, room, status or payment state. */
export function examsChanged(): void {
  entries.clear();
}

export function cachedWorklist(q: WorklistQuery, timeZone: string, now = Date.now()): Promise<PageJson> {
  if (TTL_MS <= 0) return worklist(q, timeZone).then(serialize);
  const key = `${timeZone}|${q.day}|${q.roomId ?? ''}|${q.sonographerId ?? ''}|${q.status ?? ''}|${q.page}|${q.pageSize}|${q.sort}|${q.dir}`;
  const hit = entries.get(key);
  if (hit && now - hit.at < TTL_MS) return hit.page;
  if (entries.size >= MAX_ENTRIES) entries.clear();
  const page = worklist(q, timeZone).then(serialize);
  entries.set(key, { at: now, page });
  // A failed query is not remembered.
  page.catch(() => entries.delete(key));
  return page;
}

const serialize = (page: Page): PageJson => JSON.stringify(page);
