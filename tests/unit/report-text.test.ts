import { describe, expect, it } from 'vitest';
import { canonicalJson } from '../../src/lib/canonical-json';
import { findingsToHtml, plainText, sanitizeReportHtml } from '../../src/server/report-text/sanitize';

describe('sanitizeReportHtml', () => {
  it('keeps what the editor offers: paragraphs, two heading levels, lists, bold, line breaks', () => {
    const html = '<h2>Liver</h2><h3>Size</h3><p>Normal<br />size.</p><ol start="3"><li><p><strong>One</strong></p></li></ol><ul><li>Two</li></ul>';
    expect(sanitizeReportHtml(html)).toBe(html);
  });
  it('drops scripts with their content, every attribute, and unknown tags (their text stays)', () => {
    expect(sanitizeReportHtml('<p onmouseover="x()" class="a">Hi<script>alert(1)</script><style>p{}</style></p>')).toBe('<p>Hi</p>');
    expect(sanitizeReportHtml('<p><a href="javascript:alert(1)">link</a> <em>soft</em> <u>under</u></p>')).toBe('<p>link soft under</p>');
    expect(sanitizeReportHtml('<svg onload="x()"><circle/></svg><img src="x" onerror="y()"><p>ok</p>')).toBe('<p>ok</p>');
  });
  it('keeps a numbered list\'s start only as a whole number', () => {
    expect(sanitizeReportHtml('<ol start="javascript:x"><li>a</li></ol>')).toBe('<ol><li>a</li></ol>');
    expect(sanitizeReportHtml('<ol start="2" type="a" onclick="x()"><li>a</li></ol>')).toBe('<ol start="2"><li>a</li></ol>');
  });
  it('maps pasted bold and headings onto the allowed ones', () => {
    expect(sanitizeReportHtml('<h1>Title</h1><h4>Sub</h4><p><b>b</b></p>')).toBe('<h2>Title</h2><h3>Sub</h3><p><strong>b</strong></p>');
  });
  it('treats an empty editor as no text', () => {
    expect(sanitizeReportHtml('<p></p>')).toBe('');
    expect(sanitizeReportHtml('<p> <br></p>')).toBe('');
  });
});

describe('plainText and findingsToHtml', () => {
  it('reads the visible text, one block a line, entities decoded', () => {
    expect(plainText('<h2>A &amp; B</h2><ul><li>x &lt; 3</li><li>y</li></ul>')).toBe('A & B\nx < 3\ny');
  });
  it('turns the generated findings into escaped paragraphs', () => {
    expect(findingsToHtml('Liver 14 cm.\n\nCBD <6 mm & normal.')).toBe('<p>Liver 14 cm.</p><p>CBD &lt;6 mm &amp; normal.</p>');
    expect(findingsToHtml(null)).toBe('');
  });
});

describe('canonicalJson', () => {
  it('gives the same text whatever the key order, at every depth', () => {
    expect(canonicalJson({ b: 1, a: { d: [2, { z: 1, y: null }], c: 'x' } })).toBe('{"a":{"c":"x","d":[2,{"y":null,"z":1}]},"b":1}');
    expect(canonicalJson({ a: 1, b: 2 })).toBe(canonicalJson({ b: 2, a: 1 }));
  });
  it('leaves out undefined members as JSON does, and keeps array positions', () => {
    expect(canonicalJson({ a: undefined, b: [undefined, 1] })).toBe('{"b":[null,1]}');
  });
});
