import { PDFParse } from 'pdf-parse';
import { describe, expect, it } from 'vitest';
import { CAUTION_TEXT } from '../../src/lib/caution';
import { evaluate, getTemplate, REFERENCE_SET_VERSION } from '../../src/lib/clinical';
import type { ReportContext, ReportDto } from '../../src/lib/schemas/reports';
import { printable, segments } from '../../src/server/pdf/fonts';
import { blocksText, decodeEntities, htmlToBlocks } from '../../src/server/pdf/html-runs';
import { renderReportPdf } from '../../src/server/pdf/render';
import { buildReportPdfModel, type ReportPdfInput } from '../../src/server/pdf/report-model';
import { findingsToHtml, sanitizeReportHtml } from '../../src/server/report-text/sanitize';
import { expectOk, fullEchoInput } from './clinical/helpers';

const plain = (text: string) => ({ text, bold: false });
const bold = (text: string) => ({ text, bold: true });

describe('htmlToBlocks', () => {
  it('keeps paragraphs and headings, with bold runs where the physician put them', () => {
    expect(htmlToBlocks('<h2>Left ventricle</h2><h3>Size</h3><p>LV <strong>normal</strong> in size.</p>')).toEqual([
      { kind: 'heading', level: 2, runs: [plain('Left ventricle')] },
      { kind: 'heading', level: 3, runs: [plain('Size')] },
      { kind: 'paragraph', runs: [plain('LV '), bold('normal'), plain(' in size.')] },
    ]);
  });

  it('numbers ordered lists from their start and bullets the others, nested one level deeper', () => {
    const blocks = htmlToBlocks('<ol start="3"><li><p>Third</p></li><li><p>Fourth</p><ul><li><p>detail</p></li></ul></li></ol><ul><li>bare item</li></ul>');
    expect(blocks).toEqual([
      { kind: 'item', depth: 1, marker: '3.', runs: [plain('Third')] },
      { kind: 'item', depth: 1, marker: '4.', runs: [plain('Fourth')] },
      { kind: 'item', depth: 2, marker: '–', runs: [plain('detail')] },
      { kind: 'item', depth: 1, marker: '•', runs: [plain('bare item')] },
    ]);
  });

  it('prints a further paragraph of a list item without a second marker', () => {
    expect(htmlToBlocks('<ol><li><p>One</p><p>still one</p></li><li><p>Two</p></li></ol>').map((b) => (b.kind === 'item' ? b.marker : b.kind))).toEqual(['1.', null, '2.']);
  });

  it('turns <br> into a line break inside the block and drops it at the end', () => {
    expect(htmlToBlocks('<p>Liver normal.<br>Spleen normal.<br></p>')).toEqual([{ kind: 'paragraph', runs: [plain('Liver normal.\nSpleen normal.')] }]);
  });

  it('collapses whitespace as a browser does and leaves out empty blocks', () => {
    expect(htmlToBlocks('\n<p>  Two   spaces\n and <strong> bold </strong> text </p>\n<p> </p><p></p><ul>\n  <li><p></p></li>\n</ul>')).toEqual([
      { kind: 'paragraph', runs: [plain('Two spaces and '), bold('bold '), plain('text')] },
    ]);
  });

  it('decodes the entities the sanitizer writes and numeric ones', () => {
    expect(decodeEntities('a &amp; b &lt;c&gt; &quot;d&quot; &#39;e&#39; &#8805; &#x2264; &nbsp;&unknown;')).toBe('a & b <c> "d" \'e\' ≥ ≤ \u00a0&unknown;');
    expect(blocksText(htmlToBlocks('<p>CBD &lt;6 mm &amp; normal</p>'))).toBe('CBD <6 mm & normal');
  });

  it('reads what the sanitizer stores from a messy paste', () => {
    const stored = sanitizeReportHtml('<h1 onclick="x()">Thyroid</h1><p>Normal<script>alert(1)</script> size.</p><ul><li><b>Right</b> lobe <a href="javascript:x">here</a></li></ul>');
    expect(blocksText(htmlToBlocks(stored))).toBe('Thyroid\nNormal size.\n• Right lobe here');
    expect(htmlToBlocks(stored)[2]).toEqual({ kind: 'item', depth: 1, marker: '•', runs: [bold('Right'), plain(' lobe here')] });
  });

  it('gives back the generated findings line by line', () => {
    const lines = ['IVSd 1.0 cm, LVIDd 5.0 cm.', 'E/e′ < 8 & "normal".'];
    expect(blocksText(htmlToBlocks(findingsToHtml(lines.join('\n'))))).toBe(lines.join('\n'));
  });
});

describe('printable text in the shipped fonts', () => {
  it('writes the signs Inter’s subsets lack in words, spaced as a sentence', () => {
    expect(printable('≤ 14.0')).toBe('at most 14.0');
    expect(printable('FNA (size ≥ 1.5 cm)')).toBe('FNA (size at least 1.5 cm)');
    expect(printable('LVEF≥55 %')).toBe('LVEF at least 55 %');
  });
  it('composes accents, and cuts names into runs by the subset that has each letter', () => {
    expect(printable('Zoe\u0308')).toBe('Zoë');
    const runs = segments('Ana Dvořák', 'regular');
    expect(runs.map((r) => r.text)).toEqual(['Ana Dvo', 'ř', 'ák']);
    expect(runs[1]!.font).not.toBe(runs[0]!.font);
    expect(segments('ok \u{1F600}', 'bold').map((r) => r.text).join('')).toBe('ok \ufffd');
  });
});

/** A signed echo report from the engine's own evaluation of the CLINICAL.md worked echo set. */
function signedEcho(html: { findings: string; impression: string }, extras: Partial<ReportPdfInput['report']> = {}): ReportPdfInput {
  const input = fullEchoInput('female');
  const e = expectOk(evaluate(input));
  const template = getTemplate('echo')!;
  const report: ReportDto = {
    id: 1, examId: 1, status: 'final', version: 4, templateId: 'echo', templateVersion: template.version, referenceSetVersion: REFERENCE_SET_VERSION,
    measurements: input.measurements as Record<string, number | string>, measurementSources: {}, nodules: [], heightCm: 170, weightKg: 70, probeId: null, probeKind: 'phased-array',
    evaluation: { derived: e.derived, flags: e.flags, findings: e.findings, assessments: e.assessments, urgentPrompts: e.urgentPrompts, algorithms: e.algorithms, patient: e.patient, options: e.options, cautions: e.cautions },
    findingsText: e.findings.join('\n'), abnormalCount: 0, updatedAt: '2025-03-01T16:00:00.000Z', updatedBy: 'Dr Ada Quill', submittedAt: '2025-03-01T15:50:00.000Z',
    findingsHtml: html.findings, impressionHtml: html.impression, claimedBy: null, claimedAt: null,
    signedBy: 'Dr Ada Quill', signedAt: '2025-03-01T16:05:00.000Z', signedHash: 'ab'.repeat(32), addenda: [], communications: [], ...extras,
  };
  const context: ReportContext = {
    examId: 1, examVersion: 2, examStatus: 'completed', accessionNumber: 'ACC-TEST-7', examTypeName: 'Echocardiogram, transthoracic', indication: 'Dyspnoea.',
    patient: { name: 'Rowan, Edda', mrn: 'MRN-77', sex: 'female', birthDate: '1970-03-01', ageYears: 55 }, examDate: '2025-03-01', when: 'Sat 1 Mar 2025 at 09:30',
    room: 'Room 3', sonographer: 'Sam Bright', probes: [],
  };
  return {
    report, context, template, timeZone: 'America/Chicago',
    clinic: { name: 'Test Clinic', addressLines: ['1 Main St'], phone: '+1 555 0100', email: 'desk@clinic.test' },
    exam: { startsAt: '2025-03-01T15:30:00.000Z', referrer: null },
  };
}

async function pdfText(bytes: Buffer): Promise<{ text: string; pages: number }> {
  const parser = new PDFParse({ data: new Uint8Array(bytes) });
  try {
    const result = await parser.getText();
    return { text: result.text.replace(/\s+/g, ' '), pages: result.total };
  } finally {
    await parser.destroy();
  }
}

describe('the physician’s text in the rendered PDF', () => {
  it('is real text: headings, bullets, numbers and bold words can be found in the text layer', async () => {
    const input = signedEcho({
      findings: '<h2>Left heart</h2><p>Walls <strong>mildly thickened</strong>.</p><ul><li><p>LV size normal</p></li></ul>',
      impression: '<ol start="2"><li><p>Eccentric hypertrophy</p></li></ol>',
    });
    const { text, pages } = await pdfText(await renderReportPdf(buildReportPdfModel(input)));
    expect(text).toContain('Left heart Walls mildly thickened.');
    expect(text).toContain('• LV size normal');
    expect(text).toContain('2. Eccentric hypertrophy');
    expect(text).toContain(CAUTION_TEXT);
    expect(text).toContain(`Page ${pages} of ${pages}`);
    // Average E/e′ against ≤ 14 (Nagueh SF et al. JASE 2016, the reference row of the echo set), printed in words.
    const ee = input.report.evaluation!.flags.find((f) => f.valueCode === 'eOverEPrimeAverage')!;
    expect(text).toContain(`${ee.display} Normal at most 14.0 (all adults)`);
    expect(text).toContain(ee.source!);
  });

  it('prints an urgent-communication statement and addenda when the report has them', async () => {
    const input = signedEcho(
      { findings: '<p>Findings.</p>', impression: '<p>Impression.</p>' },
      {
        communications: [
          { id: 1, ruleId: null, finding: 'Pericardial effusion with chamber collapse.', recipientName: 'Dr Lane', recipientRole: 'on-call physician', method: 'telephone', communicatedAt: '2025-03-01T16:40:00.000Z', readBack: true, recordedBy: 'Dr Ada Quill', recordedAt: '2025-03-01T16:41:00.000Z' },
        ],
        addenda: [{ id: 1, bodyHtml: '<p>Prior study <strong>compared</strong>.</p>', signedBy: 'Dr Ada Quill', signedAt: '2025-03-03T14:05:00.000Z', signedHash: 'cd'.repeat(32) }],
      },
    );
    const { text } = await pdfText(await renderReportPdf(buildReportPdfModel(input)));
    // 16:40 UTC is 10:40 in Chicago (CST, UTC−6) on 1 Mar 2025.
    expect(text).toContain('Direct communication of urgent findings Urgent finding communicated: Pericardial effusion with chamber collapse. Told to Dr Lane (on-call physician) by telephone on Sat, 1 Mar 2025 at 10:40 by Dr Ada Quill; the finding was read back.');
    expect(text).toContain(`Content fingerprint (SHA-256): ${'cd'.repeat(32)}`);
    expect(text.indexOf('Addendum 1, signed by Dr Ada Quill')).toBeGreaterThan(text.indexOf('Electronically signed by Dr Ada Quill'));
    expect(text).toContain('Prior study compared.');
  });

  it('is made only for a signed report', () => {
    const input = signedEcho({ findings: '', impression: '' }, { status: 'preliminary', signedAt: null, signedBy: null, signedHash: null });
    expect(() => buildReportPdfModel(input)).toThrow(/signed/);
  });
});
