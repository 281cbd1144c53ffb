import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { sfntFromWoff } from './woff';

/**
 * Inter, as shipped with the app by @fontsource/inter, for the PDFs. Fontsource splits the font
 * by script (latin, latin-ext, greek, …); a text is cut into runs by the first subset that has
 * each character, so names like "Dvořák" or "Nguyễn" print with real glyphs.
 *
 * The files are read, unpacked from WOFF and parsed by fontkit once per process; every document
 * embeds only the glyphs it uses.
 */

export type Weight = 'regular' | 'bold';

/** What pdfkit needs of a parsed fontkit font (pdfkit accepts those in place of a file since 0.16). */
interface ParsedFont {
  layout(text: string, features?: unknown): GlyphRun;
  hasGlyphForCodePoint(codePoint: number): boolean;
}

interface GlyphRun {
  glyphs: unknown[];
  positions: Array<Record<string, number>>;
  readonly advanceWidth: number;
}

/** A stretch of text and the registered font name to print it with. */
export interface Segment {
  font: string;
  text: string;
}

const SUBSETS = ['latin', 'latin-ext', 'greek', 'cyrillic', 'vietnamese'] as const;
const FILE_WEIGHT: Readonly<Record<Weight, number>> = { regular: 400, bold: 700 };

/**
 * Signs no shipped Inter subset has (Google's subsets leave out mathematical operators), written
 * out in words so the printed range reads exactly as on screen, e.g. "≤ 14.0" → "at most 14.0".
 */
const IN_WORDS: Readonly<Record<string, string>> = { '≤': 'at most', '≥': 'at least', '≈': 'about', '→': 'to' };
const IN_WORDS_PATTERN = /(\S)?([≤≥≈→])(\S)?/gu;

interface LoadedFonts {
  names: Readonly<Record<Weight, readonly string[]>>;
  faces: ReadonlyMap<string, ParsedFont>;
}

let loaded: LoadedFonts | null = null;

function loadFonts(): LoadedFonts {
  if (loaded) return loaded;
  const here = createRequire(import.meta.url);
  // fontkit through pdfkit's own resolution: the very copy pdfkit depends on, not a guess.
  const fontkit = createRequire(here.resolve('pdfkit'))('fontkit') as { create(data: Buffer): ParsedFont };
  const faces = new Map<string, ParsedFont>();
  const names = { regular: [] as string[], bold: [] as string[] };
  for (const weight of ['regular', 'bold'] as const) {
    for (const subset of SUBSETS) {
      const file = here.resolve(`@fontsource/inter/files/inter-${subset}-${FILE_WEIGHT[weight]}-normal.woff`);
      const name = `Inter-${weight}-${subset}`;
      faces.set(name, withLayoutCache(fontkit.create(sfntFromWoff(readFileSync(file)))));
      names[weight].push(name);
    }
  }
  loaded = { names, faces };
  return loaded;
}

const LAYOUT_CACHE_WORDS = 5_000;

/**
 * The face with its shaping results kept between documents. pdfkit shapes each word once per
 * document, and shaping (Inter's contextual alternates above all) is most of a report's render
 * time; words repeat from report to report (labels, units, sources). pdfkit scales the positions
 * it gets in place, so every caller gets its own copy.
 */
function withLayoutCache(font: ParsedFont): ParsedFont {
  const cache = new Map<string, { glyphs: unknown[]; positions: Array<Record<string, number>> }>();
  const cached: ParsedFont = Object.create(font);
  cached.layout = (text, features) => {
    const key = features === undefined ? text : `${JSON.stringify(features)}\u0000${text}`;
    let hit = cache.get(key);
    if (!hit) {
      const run = font.layout(text, features);
      hit = { glyphs: run.glyphs, positions: run.positions.map((p) => ({ xAdvance: p.xAdvance!, yAdvance: p.yAdvance!, xOffset: p.xOffset!, yOffset: p.yOffset! })) };
      // Bounded: free text brings new words forever; starting over is cheap.
      if (cache.size >= LAYOUT_CACHE_WORDS) cache.clear();
      cache.set(key, hit);
    }
    const positions = hit.positions.map((p) => ({ ...p }));
    return {
      glyphs: hit.glyphs,
      positions,
      get advanceWidth() {
        return positions.reduce((sum, p) => sum + p.xAdvance!, 0);
      },
    };
  };
  return cached;
}

/** Registers every face with a new document (call once per document, before any text). */
export function registerFonts(doc: PDFKit.PDFDocument): void {
  for (const [name, face] of loadFonts().faces) doc.registerFont(name, face as unknown as PDFKit.Mixins.PDFFontSource);
}

/** The main face of a weight (the latin subset), e.g. for measuring a line of digits. */
export const mainFont = (weight: Weight): string => loadFonts().names[weight][0]!;

/** Text as the shipped fonts can print it: composed (NFC), with the few missing signs in words. */
export function printable(text: string): string {
  return text
    .normalize('NFC')
    .replace(IN_WORDS_PATTERN, (_m, before: string | undefined, sign: string, after: string | undefined) =>
      `${before ?? ''}${before ? ' ' : ''}${IN_WORDS[sign]}${after ? ' ' : ''}${after ?? ''}`,
    );
}

const choice = new Map<string, number>();

/**
 * Cuts printable text into runs by subset, e.g. "Ana Dvořák" → [latin "Ana Dvo", latin-ext "ř",
 * latin "ák"]. A character no subset has prints as "�" rather than as an invisible box.
 */
export function segments(text: string, weight: Weight): Segment[] {
  const { names, faces } = loadFonts();
  const list = names[weight];
  const out: Segment[] = [];
  let current = -1;
  let buffer = '';
  for (const ch of text) {
    const code = ch.codePointAt(0)!;
    let index: number;
    // Spaces and line breaks never switch faces; ASCII is always in latin.
    if (current >= 0 && (ch === ' ' || ch === '\n')) index = current;
    else if (code < 0x80) index = 0;
    else {
      const key = `${weight}:${code}`;
      let cached = choice.get(key);
      if (cached === undefined) {
        cached = list.findIndex((name) => faces.get(name)!.hasGlyphForCodePoint(code));
        choice.set(key, cached);
      }
      index = cached;
    }
    const glyph = index === -1 ? '\ufffd' : ch;
    if (index === -1) index = 0;
    if (index !== current && buffer !== '') {
      out.push({ font: list[current]!, text: buffer });
      buffer = '';
    }
    current = index;
    buffer += glyph;
  }
  if (buffer !== '') out.push({ font: list[Math.max(current, 0)]!, text: buffer });
  return out;
}
