import { readdirSync, readFileSync, statSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';

// STYLE.md: islands import only from src/lib; src/lib is isomorphic (no server, database,
// Node or Astro import), so nothing server-side can reach a browser bundle.
const SRC = path.resolve(import.meta.dirname, '../../src');

function files(dir: string): string[] {
  return readdirSync(dir).flatMap((n) => {
    const p = path.join(dir, n);
    return statSync(p).isDirectory() ? files(p) : /\.(ts|tsx)$/.test(n) ? [p] : [];
  });
}

function imports(file: string): string[] {
  const src = readFileSync(file, 'utf8');
  return [...src.matchAll(/(?:^|\n)\s*(?:import|export)\s[^'"]*?from\s+['"]([^'"]+)['"]/g), ...src.matchAll(/import\(\s*['"]([^'"]+)['"]\s*\)/g)].map((m) => m[1]!);
}

const FORBIDDEN = [/^sequelize$/, /^mariadb$/, /^pino$/, /^@node-rs\//, /^node:/, /^astro(:|$)/, /(^|\/)server\//, /(^|\/)db\//];

describe('browser-safe code', () => {
  for (const dir of ['lib', 'islands']) {
    for (const file of files(path.join(SRC, dir))) {
      const rel = path.relative(SRC, file);
      it(`${rel} imports nothing server-only`, () => {
        const bad = imports(file).filter((spec) => FORBIDDEN.some((re) => re.test(spec)));
        expect(bad).toEqual([]);
      });
    }
  }

  it('islands reach outside their folder only into src/lib', () => {
    for (const file of files(path.join(SRC, 'islands'))) {
      for (const spec of imports(file).filter((s) => s.startsWith('.'))) {
        const target = path.relative(SRC, path.resolve(path.dirname(file), spec));
        expect(target.startsWith('lib') || target.startsWith('islands'), `${path.relative(SRC, file)} → ${spec}`).toBe(true);
      }
    }
  });
});
