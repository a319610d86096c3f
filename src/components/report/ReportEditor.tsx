/**
 * The report draft, edited together: Tiptap bound to the exercise's Yjs
 * document through the y-websocket provider, with the co-editors' carets and
 * names. Readers (those who may only read or comment) get the same document,
 * not editable; the server drops any change they send anyway.
 */
import Collaboration from '@tiptap/extension-collaboration';
import CollaborationCaret from '@tiptap/extension-collaboration-caret';
import { EditorContent, useEditor, useEditorState, type Editor } from '@tiptap/react';
import { useEffect, useState } from 'react';
import { WebsocketProvider } from 'y-websocket';
import * as Y from 'yjs';
import { REPORT_FIELD } from '../../lib/report/schema';
import { editorExtensions } from './nodes';
import './report.css';

export type Person = { clientId: number; name: string; color: string; mode: string; self: boolean };

const CARET_COLOURS = ['#935b17', '#2f4f73', '#a5362b', '#3a7150', '#5e3a0f', '#4a5868'];

export function colourFor(id: string): string {
  let hash = 0;
  for (const char of id) hash = (hash * 31 + char.charCodeAt(0)) >>> 0;
  return CARET_COLOURS[hash % CARET_COLOURS.length]!;
}

type Connection = { status: 'connecting' | 'connected' | 'disconnected' | 'refused'; synced: boolean; reason?: string };

function useCollaboration(exerciseId: string) {
  const [session] = useState(() => {
    const doc = new Y.Doc();
    const base = `${window.location.protocol === 'https:' ? 'wss' : 'ws'}://${window.location.host}/ws/report`;
    const provider = new WebsocketProvider(base, exerciseId, doc, { disableBc: true, connect: false });
    return { doc, provider };
  });
  const [connection, setConnection] = useState<Connection>({ status: 'connecting', synced: false });
  useEffect(() => {
    const { provider, doc } = session;
    const onStatus = ({ status }: { status: Connection['status'] }) => setConnection((c) => (c.status === 'refused' ? c : { ...c, status }));
    const onSync = (synced: boolean) => setConnection((c) => ({ ...c, synced }));
    const onClosed = (event: { code: number; reason: string }) => setConnection({ status: 'refused', synced: false, reason: event.reason || 'The server closed the connection' });
    provider.on('status', onStatus);
    provider.on('sync', onSync);
    provider.on('closed', onClosed);
    provider.connect();
    return () => {
      provider.off('status', onStatus);
      provider.off('sync', onSync);
      provider.off('closed', onClosed);
      provider.destroy();
      doc.destroy();
    };
  }, [session]);
  return { ...session, connection };
}

function usePeople(provider: WebsocketProvider): Person[] {
  const [people, setPeople] = useState<Person[]>([]);
  useEffect(() => {
    const awareness = provider.awareness;
    const read = () =>
      setPeople(
        [...awareness.getStates()].flatMap(([clientId, state]) => {
          const user = (state as { user?: { name?: string; color?: string; mode?: string } }).user;
          return user?.name ? [{ clientId, name: user.name, color: user.color ?? '#4a5868', mode: user.mode ?? 'edit', self: clientId === awareness.clientID }] : [];
        }),
      );
    awareness.on('change', read);
    read();
    return () => awareness.off('change', read);
  }, [provider]);
  return people;
}

function ToolButton({ label, active, onClick, disabled, children }: { label: string; active?: boolean; onClick: () => void; disabled?: boolean; children: React.ReactNode }) {
  return (
    <button
      type="button"
      aria-label={label}
      title={label}
      aria-pressed={active}
      disabled={disabled}
      onMouseDown={(e) => e.preventDefault()}
      onClick={onClick}
      className={`min-w-8 rounded px-2 py-1 text-sm font-medium ${active ? 'bg-ink-900 text-paper' : 'text-ink-800 hover:bg-ink-100'} disabled:opacity-40`}
    >
      {children}
    </button>
  );
}

function Toolbar({ editor }: { editor: Editor }) {
  const state = useEditorState({
    editor,
    selector: ({ editor: e }) => ({
      h2: e.isActive('heading', { level: 2 }),
      h3: e.isActive('heading', { level: 3 }),
      bold: e.isActive('bold'),
      italic: e.isActive('italic'),
      bullets: e.isActive('bulletList'),
      numbers: e.isActive('orderedList'),
      quote: e.isActive('blockquote'),
    }),
  });
  const chain = () => editor.chain().focus();
  return (
    <div role="toolbar" aria-label="Formatting" className="flex flex-wrap gap-0.5 border-b border-ink-200 bg-ink-50 px-2 py-1">
      <ToolButton label="Section heading" active={state.h2} onClick={() => chain().toggleHeading({ level: 2 }).run()}>H2</ToolButton>
      <ToolButton label="Sub-heading" active={state.h3} onClick={() => chain().toggleHeading({ level: 3 }).run()}>H3</ToolButton>
      <ToolButton label="Bold (Ctrl+B)" active={state.bold} onClick={() => chain().toggleBold().run()}><strong>B</strong></ToolButton>
      <ToolButton label="Italic (Ctrl+I)" active={state.italic} onClick={() => chain().toggleItalic().run()}><em>I</em></ToolButton>
      <ToolButton label="Bulleted list" active={state.bullets} onClick={() => chain().toggleBulletList().run()}>• List</ToolButton>
      <ToolButton label="Numbered list" active={state.numbers} onClick={() => chain().toggleOrderedList().run()}>1. List</ToolButton>
      <ToolButton label="Quotation" active={state.quote} onClick={() => chain().toggleBlockquote().run()}>“ ”</ToolButton>
      <span className="mx-1 w-px bg-ink-200" aria-hidden="true" />
      <ToolButton label="Undo your last change (Ctrl+Z)" onClick={() => chain().undo().run()}>Undo</ToolButton>
      <ToolButton label="Redo (Ctrl+Shift+Z)" onClick={() => chain().redo().run()}>Redo</ToolButton>
    </div>
  );
}

function ConnectionNote({ connection }: { connection: Connection }) {
  if (connection.status === 'refused') return <span className="text-brick-700">Not connected: {connection.reason}</span>;
  if (connection.status === 'connected' && connection.synced) return <span className="text-moss-700">Saved as you type</span>;
  if (connection.status === 'connected') return <span className="text-ink-600">Loading the draft…</span>;
  return <span className="text-bronze-700">Reconnecting… your typing is kept and sent when the connection returns</span>;
}

export function ReportEditor({ exerciseId, user, editable, onPeople }: { exerciseId: string; user: { id: string; name: string }; editable: boolean; onPeople?: (people: Person[]) => void }) {
  const { doc, provider, connection } = useCollaboration(exerciseId);
  const people = usePeople(provider);
  useEffect(() => onPeople?.(people), [people, onPeople]);
  const editor = useEditor({
    immediatelyRender: false,
    editable,
    extensions: [
      ...editorExtensions,
      Collaboration.configure({ document: doc, field: REPORT_FIELD }),
      CollaborationCaret.configure({ provider, user: { name: user.name, color: colourFor(user.id) } }),
    ],
    editorProps: { attributes: { class: 'report-doc min-h-[60vh] px-6 py-5', 'aria-label': 'Report draft', 'data-testid': 'report-editor' } },
  });
  return (
    <div className="panel overflow-hidden">
      {editor && editable && <Toolbar editor={editor} />}
      <div className="flex items-center justify-between gap-3 border-b border-ink-100 px-4 py-1.5 text-xs" aria-live="polite" data-testid="connection">
        <ConnectionNote connection={connection} />
        {!editable && <span className="tag bg-ink-100 text-ink-700">Read only</span>}
      </div>
      <EditorContent editor={editor} />
    </div>
  );
}
