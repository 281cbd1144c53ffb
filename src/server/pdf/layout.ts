import { mainFont, printable, segments, type Weight } from './fonts';
import type { RichBlock } from './html-runs';

/**
 * Small layout primitives over pdfkit for Crestline's printed documents: styled text in the
 * shipped fonts, keep-together checks, a table that repeats its header after a page break, and
 * rich-text blocks. Letter paper, points (72 per inch).
 */

export const PAGE = { width: 612, height: 792, left: 54, right: 54, top: 58, bottom: 62 } as const;
export const CONTENT_WIDTH = PAGE.width - PAGE.left - PAGE.right;

/** Crestline's palette (tailwind.config.mjs): ink for text, crest teal for rules and headings. */
export const COLOR = {
  ink: '#141d29',
  body: '#1f2b3b',
  secondary: '#394b62',
  muted: '#4c6079',
  hairline: '#e6eaf0',
  accent: '#1b7a6c',
  accentDark: '#186258',
  panel: '#eefaf7',
  note: '#f4f6f9',
  high: '#8a2a1a',
  highPanel: '#fdf1ef',
  highRule: '#f5c4bb',
  low: '#1d4180',
} as const;

export interface TextStyle {
  size: number;
  weight?: Weight;
  color?: string;
  align?: 'left' | 'right' | 'center';
  lineGap?: number;
}

const LINE_GAP = 1.5;

/** Height the text takes at a width (measured in the main face; the other subsets have the same metrics). */
export function heightOf(doc: PDFKit.PDFDocument, text: string, width: number, style: TextStyle): number {
  if (text === '') return 0;
  doc.font(mainFont(style.weight ?? 'regular')).fontSize(style.size);
  return doc.heightOfString(printable(text), { width, lineGap: style.lineGap ?? LINE_GAP });
}

/**
 * Writes one styled text at (x, y) wrapped to `width`, switching faces where the script needs
 * it; leaves doc.y under the text.
 */
export function write(doc: PDFKit.PDFDocument, text: string, x: number, y: number, width: number, style: TextStyle): void {
  if (text === '') return;
  writeRuns(doc, [{ text, bold: style.weight === 'bold' }], x, y, width, style);
}

/** Writes runs of one paragraph (regular and bold) as continued text. */
export function writeRuns(doc: PDFKit.PDFDocument, runs: ReadonlyArray<{ text: string; bold: boolean }>, x: number, y: number, width: number, style: TextStyle): void {
  const pieces = runs.flatMap((r) => segments(printable(r.text), r.bold ? 'bold' : 'regular'));
  doc.fillColor(style.color ?? COLOR.body).fontSize(style.size);
  pieces.forEach((p, i) => {
    const continued = i < pieces.length - 1;
    doc.font(p.font);
    if (i === 0) doc.text(p.text, x, y, { width, align: style.align ?? 'left', lineGap: style.lineGap ?? LINE_GAP, continued });
    else doc.text(p.text, { continued });
  });
}

export const pageBottom = (): number => PAGE.height - PAGE.bottom;

/** Starts a new page when `height` no longer fits under the cursor; returns the y to draw at. */
export function ensureSpace(doc: PDFKit.PDFDocument, height: number): number {
  if (doc.y + height > pageBottom()) {
    doc.addPage();
    doc.y = PAGE.top;
  }
  return doc.y;
}

export function rule(doc: PDFKit.PDFDocument, y: number, color: string = COLOR.hairline, width = 0.5, x = PAGE.left, length = CONTENT_WIDTH): void {
  doc.save().moveTo(x, y).lineTo(x + length, y).lineWidth(width).strokeColor(color).stroke().restore();
}

/** A section heading in the accent colour with a hairline under it, kept with `keep` points of what follows. */
export function sectionHeading(doc: PDFKit.PDFDocument, title: string, keep = 40): void {
  const y = ensureSpace(doc, 26 + keep) + 10;
  write(doc, title, PAGE.left, y, CONTENT_WIDTH, { size: 10.5, weight: 'bold', color: COLOR.accent });
  rule(doc, doc.y + 1, COLOR.accent, 0.6);
  doc.y += 6;
}

export interface Column {
  header: string;
  width: number;
}

export interface Cell {
  text: string;
  style?: Partial<TextStyle>;
  /** A smaller grey line under the text. */
  sub?: string | null;
  /** Columns the cell covers (default 1); the cells it covers are skipped. */
  span?: number;
}

export type TableRow = { group: string } | { cells: ReadonlyArray<Cell | null> };

const CELL = { padX: 4, padY: 3.5, size: 8.5, subSize: 7 } as const;

/** A table of rows and group titles; each row stays on one page, the header repeats after a break. */
export function table(doc: PDFKit.PDFDocument, columns: readonly Column[], rows: readonly TableRow[]): void {
  const header = () => {
    const y = doc.y;
    let x = PAGE.left;
    for (const c of columns) {
      write(doc, c.header, x + CELL.padX, y + 2, c.width - 2 * CELL.padX, { size: 7.5, weight: 'bold', color: COLOR.muted });
      x += c.width;
    }
    doc.y = y + 14;
    rule(doc, doc.y, COLOR.accent, 0.6);
    doc.y += 1;
  };
  // Each drawn cell with its x and the width it may fill.
  const placed = (cells: ReadonlyArray<Cell | null>) => {
    const out: Array<{ cell: Cell; x: number; width: number }> = [];
    let x = PAGE.left;
    for (let i = 0; i < columns.length; ) {
      const cell = cells[i];
      const span = Math.max(1, Math.min(cell?.span ?? 1, columns.length - i));
      const width = columns.slice(i, i + span).reduce((sum, c) => sum + c.width, 0);
      if (cell && cell.text !== '') out.push({ cell, x: x + CELL.padX, width: width - 2 * CELL.padX });
      x += width;
      i += span;
    }
    return out;
  };
  const heightOfRow = (cells: ReadonlyArray<Cell | null>) =>
    Math.max(
      0,
      ...placed(cells).map(({ cell, width }) => {
        const sub = cell.sub ? heightOf(doc, cell.sub, width, { size: CELL.subSize }) + 1 : 0;
        return heightOf(doc, cell.text, width, { size: CELL.size, ...cell.style }) + sub;
      }),
    ) + 2 * CELL.padY;

  // The header never stands alone at the foot of a page.
  ensureSpace(doc, 64);
  header();
  rows.forEach((row, index) => {
    if ('group' in row) {
      const next = rows[index + 1];
      const keep = next && 'cells' in next ? heightOfRow(next.cells) : 0;
      if (doc.y + 18 + keep > pageBottom()) {
        doc.addPage();
        doc.y = PAGE.top;
        header();
      }
      write(doc, row.group, PAGE.left + CELL.padX, doc.y + 7, CONTENT_WIDTH, { size: 8, weight: 'bold', color: COLOR.accentDark });
      doc.y += 3;
      return;
    }
    const height = heightOfRow(row.cells);
    if (doc.y + height > pageBottom()) {
      doc.addPage();
      doc.y = PAGE.top;
      header();
    }
    const top = doc.y;
    for (const { cell, x, width } of placed(row.cells)) {
      write(doc, cell.text, x, top + CELL.padY, width, { size: CELL.size, color: COLOR.body, ...cell.style });
      if (cell.sub) write(doc, cell.sub, x, doc.y + 1, width, { size: CELL.subSize, color: COLOR.muted });
    }
    doc.y = top + height;
    rule(doc, doc.y);
  });
  doc.y += 4;
}

/** Label–value pairs in two columns of a block; returns the height used (or would use, when `draw` is false). */
export function fieldList(doc: PDFKit.PDFDocument, fields: ReadonlyArray<{ label: string; value: string }>, x: number, y: number, width: number, labelWidth: number, draw = true): number {
  let at = y;
  for (const f of fields) {
    const valueWidth = width - labelWidth;
    const h = Math.max(heightOf(doc, f.label, labelWidth - 6, { size: 8 }), heightOf(doc, f.value, valueWidth, { size: 9 }));
    if (draw) {
      write(doc, f.label, x, at + 0.8, labelWidth - 6, { size: 8, color: COLOR.muted });
      write(doc, f.value, x + labelWidth, at, valueWidth, { size: 9, color: COLOR.ink });
    }
    at += h + 3;
  }
  return at - y;
}

const INDENT = 14;

/** Findings or impression: headings, paragraphs, bulleted and numbered items, bold runs. */
export function richText(doc: PDFKit.PDFDocument, blocks: readonly RichBlock[]): void {
  if (blocks.length === 0) write(doc, 'None recorded.', PAGE.left, doc.y, CONTENT_WIDTH, { size: 9.5, color: COLOR.muted });
  for (const b of blocks) {
    if (b.kind === 'heading') {
      const size = b.level === 2 ? 10 : 9.5;
      const y = ensureSpace(doc, 30) + (b.level === 2 ? 6 : 4);
      writeRuns(doc, b.runs.map((r) => ({ ...r, bold: true })), PAGE.left, y, CONTENT_WIDTH, { size, color: b.level === 2 ? COLOR.ink : COLOR.secondary });
      doc.y += 2;
      continue;
    }
    const indent = b.kind === 'item' ? b.depth * INDENT : 0;
    const y = ensureSpace(doc, 14);
    if (b.kind === 'item' && b.marker) {
      write(doc, b.marker, PAGE.left + indent - INDENT, y, INDENT - 4, { size: 9.5, align: 'right', color: COLOR.secondary });
    }
    writeRuns(doc, b.runs, PAGE.left + indent, y, CONTENT_WIDTH - indent, { size: 9.5, lineGap: 2.5 });
    doc.y += b.kind === 'item' ? 2 : 5;
  }
}
