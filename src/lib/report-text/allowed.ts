/**
 * Every HTML tag a physician's findings or impression may contain, shared by the editor
 * (src/islands/reading/RichTextField.tsx, whose schema offers exactly these) and the server's
 * sanitizer (src/server/report-text/sanitize.ts), so what the editor can produce is what the
 * server keeps. Framework-free on purpose: the browser and the server both import it.
 *
 * @example REPORT_TEXT_TAGS.includes('h2') // true; 'em', 'a', 'h1' are not allowed
 */
export const REPORT_TEXT_TAGS = ['p', 'h2', 'h3', 'ul', 'ol', 'li', 'strong', 'br'] as const;
