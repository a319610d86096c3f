/** A rich-text field for briefs (Tiptap), with a small toolbar usable from the keyboard. */
import { EditorContent, useEditor, useEditorState, type Editor, type JSONContent } from '@tiptap/react';
import StarterKit from '@tiptap/starter-kit';
import { useEffect } from 'react';
import './rich-text.css';

type Props = {
  id: string;
  label: string;
  value: JSONContent | null;
  onChange: (value: JSONContent) => void;
  placeholder?: string;
  readOnly?: boolean;
};

const EMPTY: JSONContent = { type: 'doc', content: [{ type: 'paragraph' }] };

export function RichText({ id, label, value, onChange, placeholder, readOnly = false }: Props) {
  const editor = useEditor({
    extensions: [StarterKit.configure({ link: false, heading: { levels: [3, 4] } })],
    content: value ?? EMPTY,
    editable: !readOnly,
    immediatelyRender: false,
    editorProps: {
      attributes: {
        id,
        'aria-label': label,
        'aria-multiline': 'true',
        role: 'textbox',
        class: 'prose-brief min-h-28 px-3 py-2 focus:outline-none',
        ...(placeholder ? { 'data-placeholder': placeholder } : {}),
      },
    },
    // Only the author's own edits count: Tiptap also updates when it normalises loaded content.
    onUpdate: ({ editor }) => {
      if (editor.isFocused) onChange(editor.getJSON());
    },
  });

  // Another part of the page (undo, a reload) replaced the value: show it.
  useEffect(() => {
    if (!editor || editor.isFocused) return;
    const next = value ?? EMPTY;
    if (JSON.stringify(editor.getJSON()) !== JSON.stringify(next)) editor.commands.setContent(next, { emitUpdate: false });
  }, [editor, value]);

  useEffect(() => editor?.setEditable(!readOnly), [editor, readOnly]);

  return (
    <div className="rounded-md border border-ink-300 bg-white focus-within:border-bronze-500">
      {editor && !readOnly && <Toolbar editor={editor} label={label} />}
      <EditorContent editor={editor} />
    </div>
  );
}

function Toolbar({ editor, label }: { editor: Editor; label: string }) {
  const state = useEditorState({
    editor,
    selector: ({ editor: e }) => ({
      bold: e.isActive('bold'),
      italic: e.isActive('italic'),
      heading: e.isActive('heading', { level: 3 }),
      bullets: e.isActive('bulletList'),
      numbers: e.isActive('orderedList'),
      quote: e.isActive('blockquote'),
    }),
  });
  const tools = [
    { key: 'bold', text: 'B', name: 'Bold', run: () => editor.chain().focus().toggleBold().run(), on: state.bold },
    { key: 'italic', text: 'I', name: 'Italic', run: () => editor.chain().focus().toggleItalic().run(), on: state.italic },
    { key: 'heading', text: 'H', name: 'Heading', run: () => editor.chain().focus().toggleHeading({ level: 3 }).run(), on: state.heading },
    { key: 'bullets', text: '•', name: 'Bulleted list', run: () => editor.chain().focus().toggleBulletList().run(), on: state.bullets },
    { key: 'numbers', text: '1.', name: 'Numbered list', run: () => editor.chain().focus().toggleOrderedList().run(), on: state.numbers },
    { key: 'quote', text: '❝', name: 'Quotation', run: () => editor.chain().focus().toggleBlockquote().run(), on: state.quote },
  ];
  return (
    <div role="toolbar" aria-label={`${label}: formatting`} className="flex gap-1 border-b border-ink-100 px-1.5 py-1">
      {tools.map((t) => (
        <button
          key={t.key}
          type="button"
          className={`rounded px-2 py-0.5 text-sm ${t.on ? 'bg-ink-900 text-paper' : 'text-ink-700 hover:bg-ink-100'}`}
          aria-pressed={t.on}
          aria-label={t.name}
          title={t.name}
          onClick={t.run}
        >
          {t.text}
        </button>
      ))}
    </div>
  );
}
