import sanitizeHtml from 'sanitize-html';
import { REPORT_TEXT_TAGS } from '../../lib/report-text/allowed';

/**
 * The server's word on a physician's findings and impression: only the tags the editor offers
 * (paragraphs, two heading levels, lists, bold, line breaks) and no attribute but a numbered
 * list's start, so no event handlers, styles, links or `javascript:` URLs survive. Script and style elements are dropped
 * with their content; any other tag is unwrapped and its text kept.
 */
export function sanitizeReportHtml(html: string): string {
  const clean = sanitizeHtml(html, {
    allowedTags: [...REPORT_TEXT_TAGS],
    // The only attribute: where a numbered list starts (typing "3. " makes one), a whole number.
    allowedAttributes: { ol: ['start'] },
    allowedSchemes: [],
    disallowedTagsMode: 'discard',
    nonTextTags: ['script', 'style', 'textarea', 'noscript', 'iframe', 'object', 'template'],
    // `b` from a paste reads as bold; the two heading levels a pasted h1 or h4 maps onto.
    transformTags: { b: 'strong', h1: 'h2', h4: 'h3', h5: 'h3', h6: 'h3' },
  })
    .replace(/<ol start="(?!\d{1,4}")[^"]*">/g, '<ol>')
    .trim();
  // An editor left empty sends "<p></p>": that is no text.
  return plainText(clean) === '' ? '' : clean;
}

/** The visible text of sanitized report HTML (for "is it empty", search and the e-mail-free summary). */
export function plainText(html: string): string {
  return sanitizeHtml(html.replace(/<\/(p|h2|h3|li)>|<br\s*\/?>/g, '$&\n'), { allowedTags: [], allowedAttributes: {} })
    .replace(/&nbsp;/g, ' ')
    .replace(/&amp;/g, '&')
    .replace(/&lt;/g, '<')
    .replace(/&gt;/g, '>')
    .replace(/&quot;/g, '"')
    .replace(/&#39;/g, "'")
    .replace(/[ \t]+\n/g, '\n')
    .replace(/\n{2,}/g, '\n')
    .trim();
}

export { findingsToHtml } from '../../lib/report-text/findings-html';
