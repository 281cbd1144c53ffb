import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { createAutosaver, type SaveStatus } from '@/lib/report-form/autosave';

type Report = { version: number; updatedBy: string };

/** A fake server: each send waits until the test resolves or rejects it. */
function harness(startVersion = 0) {
  let value = 'a';
  const calls: Array<{ snapshot: string; version: number; resolve: (v: number) => void; reject: (e: unknown) => void }> = [];
  const statuses: SaveStatus<Report>[] = [];
  const saver = createAutosaver<string, { version: number }, Report>({
    version: startVersion,
    delayMs: 800,
    retryMs: 1000,
    snapshot: () => value,
    send: (snapshot, version) =>
      new Promise((resolve, reject) => {
        calls.push({ snapshot, version, resolve: (v) => resolve({ version: v }), reject });
      }),
    versionOf: (r) => r.version,
    currentOf: (f) => (f.details?.current as Report | undefined) ?? null,
    onStatus: (s) => statuses.push(s),
    now: () => new Date('2025-05-20T10:42:13Z'),
  });
  return {
    saver,
    calls,
    statuses,
    type: (v: string) => {
      value = v;
      saver.schedule();
    },
    phase: () => saver.status.phase,
  };
}

const settle = () => vi.advanceTimersByTimeAsync(0);

beforeEach(() => {
  vi.useFakeTimers();
});
afterEach(() => {
  vi.useRealTimers();
});

describe('createAutosaver', () => {
  it('saves once, 800 ms after the last change, and adopts the returned version', async () => {
    const h = harness(3);
    h.type('4');
    await vi.advanceTimersByTimeAsync(500);
    h.type('4.');
    await vi.advanceTimersByTimeAsync(500);
    h.type('4.8');
    expect(h.phase()).toBe('pending');
    await vi.advanceTimersByTimeAsync(799);
    expect(h.calls).toHaveLength(0);
    await vi.advanceTimersByTimeAsync(1);
    expect(h.calls).toEqual([expect.objectContaining({ snapshot: '4.8', version: 3 })]);
    expect(h.phase()).toBe('saving');
    h.calls[0]!.resolve(4);
    await settle();
    expect(h.phase()).toBe('saved');
    expect(h.saver.version).toBe(4);
    expect(h.saver.status.savedAt).toEqual(new Date('2025-05-20T10:42:13Z'));
  });

  it('never has two saves in flight, and then sends the newest entries with the new version', async () => {
    const h = harness(0);
    h.type('1');
    await vi.advanceTimersByTimeAsync(800);
    expect(h.calls).toHaveLength(1);
    h.type('12');
    await vi.advanceTimersByTimeAsync(800);
    h.type('123');
    await vi.advanceTimersByTimeAsync(5000);
    expect(h.calls).toHaveLength(1); // the first is still running
    h.calls[0]!.resolve(1);
    await settle();
    expect(h.calls).toHaveLength(2);
    expect(h.calls[1]).toMatchObject({ snapshot: '123', version: 1 });
    h.calls[1]!.resolve(2);
    await settle();
    expect(h.calls).toHaveLength(2);
    expect(h.phase()).toBe('saved');
    expect(h.saver.dirty).toBe(false);
  });

  it('flush saves at once and resolves when everything is saved', async () => {
    const h = harness(5);
    h.type('x');
    const flushed = h.saver.flush();
    await settle();
    expect(h.calls).toHaveLength(1);
    h.calls[0]!.resolve(6);
    await expect(flushed).resolves.toBe(true);
    await vi.advanceTimersByTimeAsync(2000);
    expect(h.calls).toHaveLength(1); // the cancelled debounce does not save again
  });

  it('flush waits for a running save and then sends what changed during it', async () => {
    const h = harness(0);
    h.type('a');
    await vi.advanceTimersByTimeAsync(800);
    h.type('ab');
    const flushed = h.saver.flush();
    h.calls[0]!.resolve(1);
    await settle();
    expect(h.calls[1]).toMatchObject({ snapshot: 'ab', version: 1 });
    h.calls[1]!.resolve(2);
    await expect(flushed).resolves.toBe(true);
  });

  it('stops on a stale save (409), keeps the entries unsaved, and saves over it only when asked', async () => {
    const h = harness(2);
    h.type('mine');
    await vi.advanceTimersByTimeAsync(800);
    const current = { version: 3, updatedBy: 'Dario Quenby' };
    h.calls[0]!.reject({ status: 409, code: 'STALE', message: 'stale', details: { current } });
    await settle();
    expect(h.phase()).toBe('conflict');
    expect(h.saver.status.current).toEqual(current);
    expect(h.saver.dirty).toBe(true);
    h.type('mine, still typing');
    await vi.advanceTimersByTimeAsync(10_000);
    expect(h.calls).toHaveLength(1); // no silent retry over their version
    const kept = h.saver.keepMine(current.version);
    await settle();
    expect(h.calls[1]).toMatchObject({ snapshot: 'mine, still typing', version: 3 });
    h.calls[1]!.resolve(4);
    await expect(kept).resolves.toBe(true);
    expect(h.phase()).toBe('saved');
  });

  it('adopt: after loading their version nothing is pending and the next change saves against it', async () => {
    const h = harness(2);
    h.type('mine');
    await vi.advanceTimersByTimeAsync(800);
    h.calls[0]!.reject({ status: 409, code: 'STALE', message: 'stale', details: { current: { version: 7, updatedBy: 'X' } } });
    await settle();
    h.saver.adopt(7);
    expect(h.saver.dirty).toBe(false);
    expect(h.phase()).toBe('saved');
    h.type('theirs, edited');
    await vi.advanceTimersByTimeAsync(800);
    expect(h.calls[1]).toMatchObject({ version: 7 });
  });

  it('a 400 shows the field errors and waits for the next change instead of retrying', async () => {
    const h = harness(0);
    h.type('48');
    await vi.advanceTimersByTimeAsync(800);
    h.calls[0]!.reject({ status: 400, code: 'VALIDATION', message: 'bad', fields: { 'measurements.rightLobeLengthCm': 'outside the plausible range' } });
    await settle();
    expect(h.phase()).toBe('invalid');
    expect(h.saver.status.fields).toEqual({ 'measurements.rightLobeLengthCm': 'outside the plausible range' });
    await vi.advanceTimersByTimeAsync(60_000);
    expect(h.calls).toHaveLength(1);
    h.type('4.8');
    await vi.advanceTimersByTimeAsync(800);
    expect(h.calls).toHaveLength(2);
  });

  it('retries after a network error, backing off, and reports the reason meanwhile', async () => {
    const h = harness(0);
    h.type('x');
    await vi.advanceTimersByTimeAsync(800);
    h.calls[0]!.reject({ status: 0, code: 'NETWORK', message: 'Crestline could not be reached.' });
    await settle();
    expect(h.phase()).toBe('error');
    expect(h.saver.status.reason).toMatch(/could not be reached/);
    await vi.advanceTimersByTimeAsync(1000);
    expect(h.calls).toHaveLength(2);
    h.calls[1]!.reject({ status: 503, code: 'UNAVAILABLE', message: 'Database down.' });
    await settle();
    await vi.advanceTimersByTimeAsync(1999);
    expect(h.calls).toHaveLength(2);
    await vi.advanceTimersByTimeAsync(1);
    expect(h.calls).toHaveLength(3);
    h.calls[2]!.resolve(1);
    await settle();
    expect(h.phase()).toBe('saved');
  });

  it('a report that is no longer a draft closes the saver', async () => {
    const h = harness(0);
    h.type('x');
    await vi.advanceTimersByTimeAsync(800);
    h.calls[0]!.reject({ status: 409, code: 'CONFLICT', message: 'This report is preliminary and can no longer be edited here.' });
    await settle();
    expect(h.phase()).toBe('closed');
    h.type('y');
    await vi.advanceTimersByTimeAsync(5000);
    expect(h.calls).toHaveLength(1);
    await expect(h.saver.flush()).resolves.toBe(false);
  });

  it('conflict() from another request holds saving like a stale save', async () => {
    const h = harness(1);
    h.saver.conflict({ version: 2, updatedBy: 'Someone' });
    expect(h.phase()).toBe('conflict');
    await expect(h.saver.flush()).resolves.toBe(false);
    expect(h.calls).toHaveLength(0);
  });
});
