/**
 * The physician's findings and impression (HTML already cleaned by sanitizeReportHtml, so only
 * p, h2, h3, ul, ol[start], li, strong and br) as blocks of text runs a PDF can lay out. A small
 * tokenizer is enough for that fixed tag set; anything else is dropped and its text kept.
 */

export interface TextRun {
  text: string;
  bold: boolean;
}

export type RichBlock =
  | { kind: 'paragraph'; runs: TextRun[] }
  | { kind: 'heading'; level: 2 | 3; runs: TextRun[] }
  /** A list item's text; `marker` is "•", "–" or "3." for its first block and null for a further paragraph in it. */
  | { kind: 'item'; depth: number; marker: string | null; runs: TextRun[] };

type Open = { kind: 'paragraph' } | { kind: 'heading'; level: 2 | 3 } | { kind: 'item'; depth: number; marker: string | null };

const NAMED: Readonly<Record<string, string>> = { amp: '&', lt: '<', gt: '>', quot: '"', apos: "'", nbsp: '\u00a0' };

/** Decodes the entities a serializer writes, e.g. "a &amp; b &#8805; c" → "a & b ≥ c"; unknown names stay as written. */
export function decodeEntities(text: string): string {
  return text.replace(/&(#x[0-9a-f]{1,6}|#[0-9]{1,7}|[a-z]+);/gi, (whole, name: string) => {
    if (name[0] !== '#') return NAMED[name.toLowerCase()] ?? whole;
    const code = name[1] === 'x' || name[1] === 'X' ? parseInt(name.slice(2), 16) : parseInt(name.slice(1), 10);
    return code > 0 && code <= 0x10ffff && !(code >= 0xd800 && code <= 0xdfff) ? String.fromCodePoint(code) : '\ufffd';
  });
}

const TOKEN = /<!--[\s\S]*?-->|<(\/?)([a-z][a-z0-9]*)\b([^>]*)>|([^<]+|<)/gi;
const SKIPPED = new Set(['script', 'style']);

/**
 * Sanitized report HTML as blocks, e.g. `<p>LV <strong>normal</strong></p><ol start="2"><li><p>A</p></li></ol>` →
 * a paragraph with runs "LV " and bold "normal", then an item with marker "2." and run "A".
 * Whitespace collapses as a browser would; `<br>` becomes "\n" inside the block.
 */
export function htmlToBlocks(html: string): RichBlock[] {
  const blocks: RichBlock[] = [];
  const lists: Array<{ ordered: boolean; next: number }> = [];
  let open: Open | null = null;
  let runs: TextRun[] = [];
  let bold = 0;
  let marker: string | null = null;
  let skipping: string | null = null;

  const flush = () => {
    if (open) {
      const cleaned = tidy(runs);
      if (cleaned.length > 0) blocks.push({ ...open, runs: cleaned } as RichBlock);
    }
    open = null;
    runs = [];
  };
  // Text outside any p or heading (a bare li, or loose text) still needs a block to live in.
  const start = (block?: Open) => {
    flush();
    if (block) open = block;
    else if (lists.length > 0) open = { kind: 'item', depth: lists.length, marker };
    else open = { kind: 'paragraph' };
    if (open.kind === 'item') marker = null;
  };
  const append = (text: string) => {
    if (!open) start();
    const last = runs[runs.length - 1];
    const isBold = bold > 0;
    if (last && last.bold === isBold) last.text += text;
    else runs.push({ text, bold: isBold });
  };

  for (const m of html.matchAll(TOKEN)) {
    const [whole, closing, rawTag, attrs, text] = m;
    if (whole.startsWith('<!--')) continue;
    const tag = rawTag?.toLowerCase();
    if (skipping) {
      if (closing && tag === skipping) skipping = null;
      continue;
    }
    if (text !== undefined) {
      const words = decodeEntities(text).replace(/[ \t\r\n\f]+/g, ' ');
      if (words.trim() === '' && !open) continue;
      append(words);
      continue;
    }
    if (!tag) continue;
    if (!closing && SKIPPED.has(tag)) {
      skipping = tag;
      continue;
    }
    switch (tag) {
      case 'p':
        if (closing) flush();
        else start(lists.length > 0 ? { kind: 'item', depth: lists.length, marker } : { kind: 'paragraph' });
        break;
      case 'h2':
      case 'h3':
        if (closing) flush();
        else start({ kind: 'heading', level: tag === 'h2' ? 2 : 3 });
        break;
      case 'ul':
      case 'ol':
        flush();
        if (closing) lists.pop();
        else lists.push({ ordered: tag === 'ol', next: tag === 'ol' ? Number(/\bstart\s*=\s*["']?(\d{1,4})/i.exec(attrs ?? '')?.[1] ?? 1) : 1 });
        break;
      case 'li': {
        flush();
        const list = lists[lists.length - 1];
        marker = closing || !list ? null : list.ordered ? `${list.next++}.` : lists.length > 1 ? '–' : '•';
        break;
      }
      case 'strong':
      case 'b':
        bold = Math.max(0, bold + (closing ? -1 : 1));
        break;
      case 'br':
        append('\n');
        break;
      default:
        // Not in the sanitizer's list: the tag goes, its text stays.
        break;
    }
  }
  flush();
  return blocks;
}

/** Drops the spaces a browser would not show (at the edges, doubled, before a line break) and empty runs. */
function tidy(runs: readonly TextRun[]): TextRun[] {
  const chars: Array<{ ch: string; bold: boolean }> = [];
  for (const run of runs) {
    for (const ch of run.text) {
      const previous = chars[chars.length - 1]?.ch;
      if (ch === ' ' && (previous === undefined || previous === ' ' || previous === '\n')) continue;
      if (ch === '\n' && previous === undefined) continue;
      if (ch === '\n' && previous === ' ') chars.pop();
      chars.push({ ch, bold: run.bold });
    }
  }
  while (chars.length > 0 && /\s/.test(chars[chars.length - 1]!.ch)) chars.pop();
  const out: TextRun[] = [];
  for (const { ch, bold } of chars) {
    const last = out[out.length - 1];
    if (last && last.bold === bold) last.text += ch;
    else out.push({ text: ch, bold });
  }
  return out;
}

/** The plain text of blocks, one line each, e.g. for a test or a search index. */
export function blocksText(blocks: readonly RichBlock[]): string {
  return blocks.map((b) => (b.kind === 'item' && b.marker ? `${b.marker} ` : '') + b.runs.map((r) => r.text).join('')).join('\n');
}
