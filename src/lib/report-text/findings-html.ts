const escapeHtml = (s: string) => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');

/**
 * The engine's generated findings (one sentence group per line) as the reading physician's
 * starting text: one escaped paragraph per line. Framework-free: the page and the server use it.
 */
export function findingsToHtml(text: string | null): string {
  return (text ?? '')
    .split('\n')
    .map((line) => line.trim())
    .filter(Boolean)
    .map((line) => `<p>${escapeHtml(line)}</p>`)
    .join('');
}
