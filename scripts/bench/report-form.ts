/**
 * The echo form in a real browser (Debian's Chromium through Playwright): the time from a
 * keystroke in a measurement to the updated derived value on screen (median of many), and the
 * JavaScript the form page ships (gzipped).
 */
import { gzipSync } from 'node:zlib';
import { chromium } from '@playwright/test';
import type { BenchFigure } from '../bench.ts';
import { fullEchoInput } from '../../tests/unit/clinical/helpers.ts';
import { benchEnv, signIn } from './env.ts';
import { draftEchoReports } from './report-save.ts';

const KEYSTROKES = 60;

export async function reportFormBench(): Promise<BenchFigure[]> {
  const e = await benchEnv();
  const [reportId] = await draftEchoReports(e, 1, 400);
  const cookie = await signIn(e.url, 'sonographer3@fernhollow.test');
  // The draft holds a full echo set, so LV mass index is on screen from the start.
  const set = fullEchoInput('female');
  const saved = await fetch(`${e.url}/api/reports/${reportId}/draft`, {
    method: 'PUT',
    headers: { cookie, origin: e.url, 'content-type': 'application/json' },
    body: JSON.stringify({ version: 0, measurements: set.measurements, nodules: [], heightCm: 165, weightKg: 62, probeId: null }),
  });
  if (!saved.ok) throw new Error(`bench: could not prefill the draft (${saved.status})`);
  const examId = e.sql(`SELECT exam_id FROM crestline_bench.reports WHERE id = ${reportId}`);

  const browser = await chromium.launch({
    executablePath: '/usr/bin/chromium',
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-dev-shm-usage', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run'],
  });
  try {
    const context = await browser.newContext();
    const [name, value] = cookie.split('=') as [string, string];
    await context.addCookies([{ name, value, url: e.url }]);
    const page = await context.newPage();
    let jsBytes = 0;
    let jsGzipped = 0;
    page.on('response', async (res) => {
      if (res.request().resourceType() !== 'script') return;
      const body = await res.body().catch(() => Buffer.alloc(0));
      jsBytes += body.length;
      jsGzipped += gzipSync(body, { level: 9 }).length;
    });
    await page.goto(`${e.url}/exams/${examId}/report`, { waitUntil: 'networkidle' });
    await page.waitForFunction(() => document.querySelectorAll('astro-island[ssr]').length === 0);
    const target = page.locator('[data-testid="derived-lvmiGM2"]');
    await target.waitFor();

    // Each keystroke is timed from the key event to the moment the LVMI text changes.
    await page.evaluate(() => {
      const w = window as unknown as { benchKey: number; benchTimes: number[] };
      w.benchTimes = [];
      document.addEventListener('keydown', (ev) => (w.benchKey = ev.timeStamp), true);
      const el = document.querySelector('[data-testid="derived-lvmiGM2"]')!;
      new MutationObserver(() => w.benchTimes.push(performance.now() - w.benchKey)).observe(el, { subtree: true, characterData: true, childList: true });
    });
    const input = page.locator('#f-measurements_lviddCm');
    await input.click();
    await input.press('End');
    for (let i = 0; i < KEYSTROKES; i++) {
      // Alternate the last digit between 0 and 9 (LVIDd 5.0 ↔ 5.9): every key changes LVMI.
      await input.press('Backspace');
      await input.press(i % 2 === 0 ? '9' : '0');
    }
    await page.waitForTimeout(300);
    const times = (await page.evaluate(() => (window as unknown as { benchTimes: number[] }).benchTimes)).sort((a, b) => a - b);
    const median = times.length ? times[Math.floor(times.length / 2)]! : NaN;
    console.log(`  (${times.length} updates timed; JS loaded ${(jsBytes / 1024).toFixed(0)} KB before compression)`);
    return [
      { label: 'keystroke → LVMI', value: median, unit: 'ms', target: 16 },
      { label: 'form page JS (gzip)', value: jsGzipped / 1024, unit: 'KB', target: 200 },
    ];
  } finally {
    await browser.close();
  }
}
