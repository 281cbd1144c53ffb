// Enter moves to the next entry in scan order (Shift+Enter to the previous), as on a
// scanner's measurement package: the hands stay on the keys while reading values off the screen.

/** The entry controls of a container in document order, one per radio group. */
function entries(container: HTMLElement): HTMLElement[] {
  const seen = new Set<string>();
  const out: HTMLElement[] = [];
  for (const el of container.querySelectorAll<HTMLInputElement | HTMLSelectElement>('[data-entry]')) {
    if (el.disabled) continue;
    if (el instanceof HTMLInputElement && el.type === 'radio') {
      if (seen.has(el.name)) continue;
      seen.add(el.name);
      const group = container.querySelectorAll<HTMLInputElement>(`input[type="radio"][name="${CSS.escape(el.name)}"]`);
      out.push([...group].find((r) => r.checked) ?? el);
      continue;
    }
    out.push(el);
  }
  return out;
}

/** Keydown handler for the form: Enter on an entry control focuses the next one. */
export function enterMovesOn(event: React.KeyboardEvent<HTMLElement>): void {
  if (event.key !== 'Enter' || event.nativeEvent.isComposing || event.altKey || event.ctrlKey || event.metaKey) return;
  const target = event.target as HTMLElement;
  if (!target.hasAttribute('data-entry')) return;
  event.preventDefault();
  const list = entries(event.currentTarget);
  const here = list.findIndex((el) => el === target || (target instanceof HTMLInputElement && target.type === 'radio' && el instanceof HTMLInputElement && el.name === target.name));
  const next = list[here + (event.shiftKey ? -1 : 1)];
  if (next) {
    next.focus();
    if (next instanceof HTMLInputElement && next.type === 'text') next.select();
  }
}
