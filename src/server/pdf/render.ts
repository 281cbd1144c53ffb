import PDFDocument from 'pdfkit';
import { registerFonts } from './fonts';
import { COLOR, CONTENT_WIDTH, PAGE, ensureSpace, fieldList, heightOf, richText, rule, sectionHeading, table, write, type Cell, type TableRow } from './layout';
import type { ReportPdfModel } from './report-model';

/**
 * Lays out a report model on Letter pages: letterhead, title, patient and exam, technique,
 * measurements with their reference checks and sources, nodules, findings, impression, urgent
 * communication, signature, addenda and the decision-support caution; then a running header and
 * "Page X of Y" on every page. Real text throughout, so it can be selected, searched and read aloud.
 */
export async function renderReportPdf(model: ReportPdfModel): Promise<Buffer> {
  const doc = new PDFDocument({
    size: 'LETTER',
    margins: { top: PAGE.top, bottom: PAGE.bottom, left: PAGE.left, right: PAGE.right },
    bufferPages: true,
    lang: 'en-US',
    displayTitle: true,
    info: { Title: model.documentTitle, Author: model.clinic.name, Subject: 'Ultrasound report', Creator: 'Crestline' },
  });
  const done = new Promise<Buffer>((resolve, reject) => {
    const chunks: Buffer[] = [];
    doc.on('data', (chunk: Buffer) => chunks.push(chunk));
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });
  registerFonts(doc);
  letterhead(doc, model);
  details(doc, model);
  measurements(doc, model);
  nodules(doc, model);
  sectionHeading(doc, 'Findings');
  richText(doc, model.findings);
  sectionHeading(doc, 'Impression');
  richText(doc, model.impression);
  urgent(doc, model);
  signature(doc, model);
  addenda(doc, model);
  caution(doc, model);
  pageFurniture(doc, model);
  doc.end();
  return done;
}

function letterhead(doc: PDFKit.PDFDocument, m: ReportPdfModel): void {
  const top = PAGE.top - 14;
  const rightWidth = 200;
  write(doc, m.clinic.name, PAGE.left, top, CONTENT_WIDTH - rightWidth - 12, { size: 15, weight: 'bold', color: COLOR.ink });
  let left = doc.y + 1;
  for (const line of m.clinic.addressLines) {
    write(doc, line, PAGE.left, left, CONTENT_WIDTH - rightWidth - 12, { size: 8.5, color: COLOR.secondary });
    left = doc.y;
  }
  let right = top + 4;
  for (const line of m.clinic.contact) {
    write(doc, line, PAGE.left + CONTENT_WIDTH - rightWidth, right, rightWidth, { size: 8.5, color: COLOR.secondary, align: 'right' });
    right = doc.y;
  }
  const y = Math.max(left, right) + 8;
  rule(doc, y, COLOR.accent, 1.6);
  write(doc, m.title, PAGE.left, y + 14, CONTENT_WIDTH, { size: 16, weight: 'bold', color: COLOR.ink });
  write(doc, m.statusLabel, PAGE.left, doc.y + 1, CONTENT_WIDTH, { size: 10.5, weight: 'bold', color: COLOR.accent });
  doc.y += 10;
}

/** Patient and exam side by side on a tinted panel, the indication under them, then the technique. */
function details(doc: PDFKit.PDFDocument, m: ReportPdfModel): void {
  const pad = 10;
  const half = (CONTENT_WIDTH - 3 * pad) / 2;
  const inner = CONTENT_WIDTH - 2 * pad;
  const heading = 14;
  const columns = Math.max(fieldList(doc, m.patient, 0, 0, half, 72, false), fieldList(doc, m.exam, 0, 0, half, 78, false));
  const indication = heightOf(doc, m.indication, inner - 72, { size: 9 });
  const height = pad + heading + columns + 4 + indication + pad;
  const top = ensureSpace(doc, height);
  doc.save().roundedRect(PAGE.left, top, CONTENT_WIDTH, height, 4).fill(COLOR.panel).restore();
  const colA = PAGE.left + pad;
  const colB = colA + half + pad;
  write(doc, 'Patient', colA, top + pad, half, { size: 8, weight: 'bold', color: COLOR.accentDark });
  write(doc, 'Exam', colB, top + pad, half, { size: 8, weight: 'bold', color: COLOR.accentDark });
  fieldList(doc, m.patient, colA, top + pad + heading, half, 72);
  fieldList(doc, m.exam, colB, top + pad + heading, half, 78);
  fieldList(doc, [{ label: 'Indication', value: m.indication }], colA, top + pad + heading + columns + 4, inner, 72);
  doc.y = top + height;

  sectionHeading(doc, 'Technique');
  const h = fieldList(doc, m.technique, PAGE.left, doc.y, CONTENT_WIDTH, 96, false);
  fieldList(doc, m.technique, PAGE.left, ensureSpace(doc, h), CONTENT_WIDTH, 96);
  doc.y += 2;
}

const MEASUREMENT_COLUMNS = [
  { header: 'Measurement', width: 158 },
  { header: 'Value', width: 64 },
  { header: 'Result', width: 120 },
  { header: 'Reference range', width: 124 },
  { header: 'Source', width: 38 },
] as const;

const TONE = {
  normal: { color: COLOR.accentDark },
  high: { color: COLOR.high, weight: 'bold' },
  low: { color: COLOR.low, weight: 'bold' },
  muted: { color: COLOR.muted },
} as const;

function measurements(doc: PDFKit.PDFDocument, m: ReportPdfModel): void {
  sectionHeading(doc, 'Measurements and reference checks', 60);
  if (m.measurementGroups.length === 0) {
    write(doc, 'No measurements recorded.', PAGE.left, doc.y, CONTENT_WIDTH, { size: 9, color: COLOR.muted });
    return;
  }
  const rows: TableRow[] = m.measurementGroups.flatMap((g) => [
    { group: g.title },
    ...g.rows.map((r) => ({
      cells: [
        { text: r.label, sub: r.note },
        // A value with no reference check may use the empty columns beside it.
        { text: r.value, style: { color: COLOR.ink }, span: r.result || r.reference ? 1 : 3 },
        r.result ? { text: r.result.text, style: TONE[r.result.tone] } : null,
        r.reference ? { text: r.reference, sub: r.referenceNote } : null,
        r.source === null ? null : { text: String(r.source), style: { color: COLOR.muted } },
      ] satisfies Array<Cell | null>,
    })),
  ]);
  table(doc, MEASUREMENT_COLUMNS, rows);
  if (m.sources.length === 0) return;
  const y = ensureSpace(doc, 40) + 4;
  write(doc, 'Sources of the reference ranges', PAGE.left, y, CONTENT_WIDTH, { size: 8, weight: 'bold', color: COLOR.secondary });
  doc.y += 2;
  m.sources.forEach((source, i) => {
    const at = ensureSpace(doc, 12);
    write(doc, String(i + 1), PAGE.left, at, 14, { size: 7.5, color: COLOR.muted });
    write(doc, source, PAGE.left + 16, at, CONTENT_WIDTH - 16, { size: 7.5, color: COLOR.secondary });
    doc.y += 1;
  });
  write(doc, 'Evidence tags: SRC+ checked against the publication; SRC~ from a secondary summary; CP common practice; MEM not yet checked against the publication.', PAGE.left, doc.y + 2, CONTENT_WIDTH, { size: 7, color: COLOR.muted });
}

const NODULE_COLUMNS = [
  { header: 'Nodule', width: 42 },
  { header: 'Location', width: 92 },
  { header: 'Size (mm)', width: 88 },
  { header: 'Points', width: 40 },
  { header: 'TI-RADS level', width: 104 },
  { header: 'Recommendation', width: 138 },
] as const;

function nodules(doc: PDFKit.PDFDocument, m: ReportPdfModel): void {
  if (m.nodules === null) return;
  sectionHeading(doc, 'Thyroid nodules (ACR TI-RADS)');
  if (m.nodules.length === 0) {
    write(doc, 'No nodules recorded.', PAGE.left, doc.y, CONTENT_WIDTH, { size: 9, color: COLOR.muted });
    return;
  }
  table(
    doc,
    NODULE_COLUMNS,
    m.nodules.map((n) => ({
      cells: [{ text: n.id, style: { weight: 'bold' } }, { text: n.location }, { text: n.sizeMm }, { text: n.points }, { text: n.level }, { text: n.recommendation, sub: n.note }],
    })),
  );
}

function urgent(doc: PDFKit.PDFDocument, m: ReportPdfModel): void {
  if (m.urgentStatement.length === 0) return;
  const pad = 9;
  const width = CONTENT_WIDTH - 2 * pad;
  const text = m.urgentStatement.join('\n');
  const height = pad + 14 + heightOf(doc, text, width, { size: 9.5 }) + pad;
  const top = ensureSpace(doc, height + 12) + 10;
  doc.save().roundedRect(PAGE.left, top, CONTENT_WIDTH, height, 4).fillAndStroke(COLOR.highPanel, COLOR.highRule).restore();
  write(doc, 'Direct communication of urgent findings', PAGE.left + pad, top + pad, width, { size: 9.5, weight: 'bold', color: COLOR.high });
  write(doc, text, PAGE.left + pad, doc.y + 2, width, { size: 9.5, color: COLOR.ink });
  doc.y = top + height;
}

function signature(doc: PDFKit.PDFDocument, m: ReportPdfModel): void {
  const fingerprint = m.signature.fingerprint ? `Content fingerprint (SHA-256): ${m.signature.fingerprint}` : '';
  const height = 16 + heightOf(doc, m.signature.statement, CONTENT_WIDTH, { size: 9.5, weight: 'bold' }) + heightOf(doc, fingerprint, CONTENT_WIDTH, { size: 7.5 }) + 6;
  const top = ensureSpace(doc, height + 10) + 12;
  rule(doc, top, COLOR.accent, 0.8);
  write(doc, m.signature.statement, PAGE.left, top + 8, CONTENT_WIDTH, { size: 9.5, weight: 'bold', color: COLOR.ink });
  if (fingerprint) write(doc, fingerprint, PAGE.left, doc.y + 3, CONTENT_WIDTH, { size: 7.5, color: COLOR.muted });
  doc.y += 4;
}

function addenda(doc: PDFKit.PDFDocument, m: ReportPdfModel): void {
  if (m.addenda.length === 0) return;
  sectionHeading(doc, 'Addenda');
  for (const a of m.addenda) {
    const y = ensureSpace(doc, 34) + 4;
    write(doc, a.heading, PAGE.left, y, CONTENT_WIDTH, { size: 9, weight: 'bold', color: COLOR.secondary });
    doc.y += 2;
    richText(doc, a.body);
    write(doc, a.fingerprint, PAGE.left, ensureSpace(doc, 12) + 2, CONTENT_WIDTH, { size: 7.5, color: COLOR.muted });
    doc.y += 4;
  }
}

function caution(doc: PDFKit.PDFDocument, m: ReportPdfModel): void {
  const pad = 8;
  const height = heightOf(doc, m.caution, CONTENT_WIDTH - 2 * pad, { size: 8 }) + 2 * pad;
  const top = ensureSpace(doc, height + 16) + 14;
  doc.save().roundedRect(PAGE.left, top, CONTENT_WIDTH, height, 4).fill(COLOR.note).restore();
  write(doc, m.caution, PAGE.left + pad, top + pad, CONTENT_WIDTH - 2 * pad, { size: 8, color: COLOR.secondary });
  doc.y = top + height;
}

/** Running header from page 2, and "Page X of Y" with the accession number on every page. */
function pageFurniture(doc: PDFKit.PDFDocument, m: ReportPdfModel): void {
  const { start, count } = doc.bufferedPageRange();
  for (let i = start; i < start + count; i += 1) {
    doc.switchToPage(i);
    // Writing inside the margins would make pdfkit start a page; lift them while drawing.
    const margins = { ...doc.page.margins };
    doc.page.margins.top = 0;
    doc.page.margins.bottom = 0;
    if (i > start) {
      write(doc, m.runningHeader, PAGE.left, 26, CONTENT_WIDTH, { size: 7.5, color: COLOR.muted });
      rule(doc, 39, COLOR.hairline, 0.5);
    }
    const y = PAGE.height - 40;
    rule(doc, y - 6, COLOR.hairline, 0.5);
    write(doc, m.footer, PAGE.left, y, CONTENT_WIDTH - 90, { size: 7.5, color: COLOR.muted });
    write(doc, `Page ${i - start + 1} of ${count}`, PAGE.left + CONTENT_WIDTH - 90, y, 90, { size: 7.5, color: COLOR.muted, align: 'right' });
    doc.page.margins = margins;
  }
}
