import { useEffect, useMemo, useRef, useState, type KeyboardEvent } from 'react';
import { EditorContent, Extension, createDocument, useEditor, useEditorState, type Editor } from '@tiptap/react';
import { StarterKit } from '@tiptap/starter-kit';
import { REPORT_TEXT_TAGS } from '../../lib/report-text/allowed';

interface Props {
  id: string;
  label: string;
  /** HTML, as the editor produces it and the server stores it. */
  value: string;
  onChange(html: string): void;
  disabled?: boolean;
  error?: string | null;
  /** Extra ids for aria-describedby, e.g. a hint under the field. */
  describedBy?: string;
}

/**
 * Paste arrives as HTML from anywhere (Word, e-mail, other reports). Map headings onto our two
 * levels the way the server's sanitizer does (h1 → h2, h4–h6 → h3) rather than letting the
 * schema flatten them to paragraphs, and drop <ol> attributes (start, type), which the server
 * strips too. Everything else is reduced by the schema itself: unknown marks vanish, unknown
 * blocks become paragraphs, their text kept.
 */
const ReportPaste = Extension.create({
  name: 'reportPaste',
  transformPastedHTML(html) {
    return html
      .replace(/<(\/?)h([1-6])(?=[\s>/])/gi, (_m, slash: string, n: string) => `<${slash}h${n === '1' ? 2 : Number(n) >= 4 ? 3 : n}`)
      .replace(/<ol\b[^>]*>/gi, '<ol>');
  },
});

/**
 * The schema is the whitelist: it holds exactly the nodes and marks behind REPORT_TEXT_TAGS
 * (p, h2, h3, ul, ol, li, strong, br). Everything else StarterKit 3 bundles that would add a
 * tag is switched off; undo/redo, the list keymap and the drop cursor add none and stay.
 * Trailing-node is off too: it appends an empty paragraph after a final list or heading,
 * which would change the stored HTML behind the physician's back.
 */
const EXTENSIONS = [
  StarterKit.configure({
    heading: { levels: [2, 3] },
    blockquote: false,
    code: false,
    codeBlock: false,
    horizontalRule: false,
    italic: false,
    strike: false,
    underline: false,
    link: false,
    gapcursor: false,
    trailingNode: false,
  }),
  ReportPaste,
];

const ALLOWED_TAGS = new Set<string>(REPORT_TEXT_TAGS);

/** Development only: say so if the editor ever emits a tag the server would strip. */
function warnOnStrayTags(html: string): void {
  const stray = new Set([...html.matchAll(/<([a-z][a-z0-9]*)/gi)].map((m) => m[1]!.toLowerCase()).filter((tag) => !ALLOWED_TAGS.has(tag)));
  if (stray.size > 0) console.warn(`RichTextField: tags outside REPORT_TEXT_TAGS: ${[...stray].join(', ')}`);
}

type Format = 'bold' | 'heading' | 'subheading' | 'bulletList' | 'orderedList';

const TOOLS: readonly { format: Format; label: string; className?: string; run(editor: Editor): boolean }[] = [
  { format: 'bold', label: 'Bold', className: 'font-bold', run: (e) => e.chain().focus().toggleBold().run() },
  { format: 'heading', label: 'Heading', run: (e) => e.chain().focus().toggleHeading({ level: 2 }).run() },
  { format: 'subheading', label: 'Subheading', run: (e) => e.chain().focus().toggleHeading({ level: 3 }).run() },
  { format: 'bulletList', label: 'Bulleted list', run: (e) => e.chain().focus().toggleBulletList().run() },
  { format: 'orderedList', label: 'Numbered list', run: (e) => e.chain().focus().toggleOrderedList().run() },
];

// The app has no typography plugin, so the editor styles its own few elements.
const EDITABLE_CLASS = [
  'min-h-40 px-3 py-2 text-sm leading-6 text-ink-900 outline-none',
  '[&_p]:my-1 [&>*:first-child]:mt-0 [&>*:last-child]:mb-0',
  '[&_h2]:mt-3 [&_h2]:mb-1 [&_h2]:text-base [&_h2]:font-semibold [&_h2]:text-ink-900',
  '[&_h3]:mt-2 [&_h3]:mb-1 [&_h3]:text-sm [&_h3]:font-semibold [&_h3]:text-ink-700',
  '[&_ul]:my-1 [&_ul]:list-disc [&_ul]:pl-5 [&_ol]:my-1 [&_ol]:list-decimal [&_ol]:pl-5',
  '[&_li]:my-0.5 [&_li>p]:my-0 [&_li]:marker:text-ink-400 [&_strong]:font-semibold',
].join(' ');

/**
 * A small rich-text field for the physician's findings or impression: the formats in
 * REPORT_TEXT_TAGS and nothing else, a toolbar for them, and an editable area named by its
 * visible label, e.g. `<RichTextField id="impression" label="Impression" value={html} onChange={setHtml} />`.
 */
export function RichTextField({ id, label, value, onChange, disabled = false, error = null, describedBy }: Props) {
  const labelId = `${id}-label`;
  const errorId = `${id}-error`;
  const descriptionIds = [error ? errorId : null, describedBy || null].filter(Boolean).join(' ');
  const invalid = Boolean(error);

  // The editor reads `content` once; later values arrive through the effect below.
  const [initialContent] = useState(value);
  // ProseMirror would write an attribute given as undefined as the string "undefined".
  const editorProps = useMemo(
    () => ({
      attributes: {
        id,
        role: 'textbox',
        'aria-multiline': 'true',
        'aria-labelledby': labelId,
        ...(descriptionIds ? { 'aria-describedby': descriptionIds } : {}),
        ...(invalid ? { 'aria-invalid': 'true' } : {}),
        ...(disabled ? { 'aria-disabled': 'true' } : {}),
        class: EDITABLE_CLASS,
      },
    }),
    [id, labelId, descriptionIds, invalid, disabled],
  );

  const emitted = useRef<string | null>(null);
  const editor = useEditor({
    extensions: EXTENSIONS,
    content: initialContent,
    editable: !disabled,
    immediatelyRender: false,
    editorProps,
    onUpdate: ({ editor: current }) => {
      const html = current.getHTML();
      if (import.meta.env.DEV) warnOnStrayTags(html);
      emitted.current = html;
      onChange(html);
    },
  });

  // A newer saved version from outside replaces the text, without an update event, so the
  // parent's onChange does not echo it back. Comparing documents, not strings, means the
  // server's re-serialization of the same text (entities, an empty "<p></p>" stored as "")
  // never resets the cursor while the physician types.
  useEffect(() => {
    if (!editor || editor.isDestroyed) return;
    // Our own last change coming back: re-parsing it would drop a space just typed at the end
    // of a line (HTML parsing collapses trailing white space).
    if (value === emitted.current) return;
    const next = createDocument(value, editor.schema, editor.options.parseOptions);
    if (next.eq(editor.state.doc)) return;
    editor.commands.setContent(value, { emitUpdate: false });
  }, [editor, value]);

  // useEditor keeps the editor's own editable flag when options change; set it here.
  useEffect(() => {
    if (editor && !editor.isDestroyed && Boolean(editor.isEditable) === disabled) editor.setEditable(!disabled, false);
  }, [editor, disabled]);

  const active = useEditorState({
    editor,
    selector: ({ editor: e }): Record<Format, boolean> | null =>
      e
        ? {
            bold: e.isActive('bold'),
            heading: e.isActive('heading', { level: 2 }),
            subheading: e.isActive('heading', { level: 3 }),
            bulletList: e.isActive('bulletList'),
            orderedList: e.isActive('orderedList'),
          }
        : null,
  });

  // One tab stop for the toolbar; arrow keys move between its buttons (the ARIA toolbar pattern).
  const toolbarRef = useRef<HTMLDivElement>(null);
  const [focusIndex, setFocusIndex] = useState(0);
  function onToolbarKeyDown(e: KeyboardEvent<HTMLDivElement>) {
    const last = TOOLS.length - 1;
    const next =
      e.key === 'ArrowRight' ? (focusIndex === last ? 0 : focusIndex + 1)
      : e.key === 'ArrowLeft' ? (focusIndex === 0 ? last : focusIndex - 1)
      : e.key === 'Home' ? 0
      : e.key === 'End' ? last
      : null;
    if (next === null) return;
    e.preventDefault();
    setFocusIndex(next);
    toolbarRef.current?.querySelectorAll('button')[next]?.focus();
  }

  const toolsDisabled = disabled || !editor;
  return (
    <div className="min-w-0">
      <label id={labelId} className="field-label" onClick={() => editor?.commands.focus()}>
        {label}
      </label>
      <div
        className={`mt-1 overflow-hidden rounded-md border shadow-sm focus-within:ring-2 focus-within:ring-crest-200 ${
          invalid ? 'border-high-600' : 'border-ink-200 focus-within:border-crest-500'
        } ${disabled ? 'bg-ink-50' : 'bg-white'}`}
      >
        <div
          ref={toolbarRef}
          role="toolbar"
          aria-label={`${label} formatting`}
          aria-controls={id}
          className="flex flex-wrap gap-1 border-b border-ink-100 bg-ink-50 px-1.5 py-1"
          onKeyDown={onToolbarKeyDown}
        >
          {TOOLS.map((tool, i) => (
            <button
              key={tool.format}
              type="button"
              tabIndex={i === focusIndex ? 0 : -1}
              aria-label={tool.label}
              aria-pressed={active?.[tool.format] ?? false}
              disabled={toolsDisabled}
              // Keep focus and selection in the text; the command puts focus back there anyway.
              onMouseDown={(e) => e.preventDefault()}
              onFocus={() => setFocusIndex(i)}
              onClick={() => editor && tool.run(editor)}
              className={`rounded px-2 py-1 text-xs text-ink-600 transition-colors hover:bg-white hover:text-ink-900 disabled:cursor-not-allowed disabled:opacity-50 disabled:hover:bg-transparent aria-pressed:bg-crest-100 aria-pressed:text-crest-800 ${tool.className ?? 'font-medium'}`}
            >
              {tool.label}
            </button>
          ))}
        </div>
        {/* The min height holds the box's place until the editor mounts after hydration. */}
        <EditorContent editor={editor} className="min-h-40" />
      </div>
      {error && (
        <p id={errorId} className="field-error text-xs" role="alert">
          {error}
        </p>
      )}
    </div>
  );
}
