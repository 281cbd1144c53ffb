import { readdirSync, readFileSync } from 'node:fs';
import { join, relative } from 'node:path';
import { fileURLToPath } from 'node:url';
import { build } from 'esbuild';
import { describe, expect, it } from 'vitest';

const root = fileURLToPath(new URL('../../../src/lib/clinical', import.meta.url));
const files = (readdirSync(root, { recursive: true }) as string[]).filter((f) => f.endsWith('.ts')).map((f) => join(root, f));
const importsOf = (source: string): string[] => [...source.matchAll(/(?:^|\n)\s*(?:import|export)[^'"]*?from\s+['"]([^'"]+)['"]/g)].map((m) => m[1] as string);

describe('clinical engine purity', () => {
  it('imports nothing but its own files (no node:, Astro, React or Sequelize)', () => {
    expect(files.length).toBeGreaterThan(20);
    for (const file of files) {
      for (const spec of importsOf(readFileSync(file, 'utf8'))) {
        expect(spec.startsWith('./') || spec.startsWith('../'), `${relative(root, file)} imports ${spec}`).toBe(true);
      }
    }
  });

  it('keeps files small (about 300 lines at most)', () => {
    for (const file of files) expect(readFileSync(file, 'utf8').split('\n').length, relative(root, file)).toBeLessThanOrEqual(300);
  });

  it('bundles for the browser and evaluates from the bundle alone', async () => {
    const out = await build({ entryPoints: [join(root, 'index.ts')], bundle: true, minify: true, format: 'esm', platform: 'browser', write: false, logLevel: 'silent' });
    const code = out.outputFiles[0]?.text ?? '';
    const engine = await import(`data:text/javascript;base64,${Buffer.from(code).toString('base64')}`);
    const r = engine.evaluate({ templateId: 'echo', measurements: { ivsdCm: 1, lviddCm: 5, pwdCm: 1 }, patient: { sex: 'male', birthDate: '1970-01-01', examDate: '2025-01-01', heightCm: 170, weightKg: 70 } });
    // CLINICAL.md §1.3 M1: 182 g, 100 g/m²
    expect(r.derived.find((d: { code: string }) => d.code === 'lvmiGM2').display).toBe('100 g/m²');
  });
});
