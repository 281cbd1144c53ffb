import { readdirSync, readFileSync, statSync } from 'node:fs';
import path from 'node:path';

export const ROOT = path.resolve(import.meta.dirname, '../..');
const PAGES = path.join(ROOT, 'src', 'pages');

function walk(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const p = path.join(dir, name);
    return statSync(p).isDirectory() ? walk(p) : [p];
  });
}

/** The URL a route file answers, with each [param] filled by `fill` (e.g. "1"). */
export function urlFor(file: string, fill = '1'): string {
  const rel = path.relative(PAGES, file).replace(/\.(ts|astro)$/, '').replace(/(^|\/)index$/, '');
  return '/' + rel.replace(/\[\.\.\.[^\]]+\]/g, fill).replace(/\[[^\]]+\]/g, fill);
}

/** Every endpoint file under src/pages/api. */
export function apiFiles(): string[] {
  return walk(path.join(PAGES, 'api')).filter((f) => f.endsWith('.ts'));
}

/** Every page file (.astro) outside src/pages/api. */
export function pageFiles(): string[] {
  return walk(PAGES).filter((f) => f.endsWith('.astro'));
}

export const METHODS = ['GET', 'POST', 'PUT', 'PATCH', 'DELETE'] as const;

/**
 * The roles a page states in its `requirePageRole(Astro, …)` call: an array literal of role
 * names, 'any', or undefined when the page has no gate.
 */
export function pageRoles(file: string): string[] | 'any' | undefined {
  const src = readFileSync(file, 'utf8');
  const m = /requirePageRole\(Astro,\s*(\[[^\]]*\]|'any')\s*\)/.exec(src);
  if (!m) return undefined;
  if (m[1] === "'any'") return 'any';
  return [...m[1]!.matchAll(/'([a-z]+)'/g)].map((x) => x[1]!);
}
