import { spawnSync } from 'node:child_process';
import { existsSync, readdirSync, statSync } from 'node:fs';
import path from 'node:path';
import { fail, say } from './say.mjs';

const INPUTS = ['src', 'public', 'astro.config.mjs', 'auth.config.ts', 'tailwind.config.mjs', 'tsconfig.json', 'package-lock.json'];

function newest(p) {
  if (!existsSync(p)) return 0;
  const st = statSync(p);
  if (!st.isDirectory()) return st.mtimeMs;
  let max = st.mtimeMs;
  for (const entry of readdirSync(p)) max = Math.max(max, newest(path.join(p, entry)));
  return max;
}

/** Builds the app into `outDir` when it is missing or older than any of its inputs. */
export function buildIfStale(root, outDir = path.join(root, 'dist')) {
  const entry = path.join(outDir, 'server', 'entry.mjs');
  const builtAt = existsSync(entry) ? statSync(entry).mtimeMs : 0;
  const changedAt = Math.max(...INPUTS.map((i) => newest(path.join(root, i))));
  if (builtAt > changedAt) return false;
  say(builtAt ? 'sources changed since the last build; building…' : 'building the app (about 15 s)…');
  const r = spawnSync('npx', ['astro', 'build', '--outDir', outDir], {
    cwd: root,
    stdio: ['ignore', 'ignore', 'inherit'],
    env: { ...process.env, ASTRO_TELEMETRY_DISABLED: '1' },
  });
  if (r.status !== 0) fail('the build failed; run `npm run build` to see why.');
  return true;
}

