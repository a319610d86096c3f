/**
 * Yjs clients of the report server for tests: the real y-websocket provider
 * over a real socket, signed in with a test client's session cookie.
 */
import WebSocket from 'ws';
import { WebsocketProvider } from 'y-websocket';
import * as Y from 'yjs';
import { yXmlFragmentToProsemirrorJSON } from '@tiptap/y-tiptap';
import type { App, Client } from './app';

export type DocClient = { doc: Y.Doc; provider: WebsocketProvider; json(): any; text(): string; close(): void };

function socketClass(app: App, cookie: string) {
  return class SignedInSocket extends WebSocket {
    constructor(url: string | URL, protocols?: string | string[]) {
      super(url, protocols, { headers: { cookie, origin: app.url } });
    }
  };
}

/** Connect to /ws/report/<exerciseId> and wait for the first full sync. */
export async function openReport(app: App, client: Client, exerciseId: string, timeoutMs = 10_000): Promise<DocClient> {
  const doc = new Y.Doc();
  const provider = new WebsocketProvider(`ws://127.0.0.1:${app.port}/ws/report`, exerciseId, doc, {
    WebSocketPolyfill: socketClass(app, client.cookie) as unknown as typeof globalThis.WebSocket,
    disableBc: true,
    maxBackoffTime: 300,
  });
  await new Promise<void>((done, fail) => {
    const timer = setTimeout(() => fail(new Error(`no sync of report ${exerciseId} within ${timeoutMs} ms`)), timeoutMs);
    provider.once('sync', () => {
      clearTimeout(timer);
      done();
    });
  });
  const json = () => yXmlFragmentToProsemirrorJSON(doc.getXmlFragment('default'));
  return { doc, provider, json, text: () => JSON.stringify(json()), close: () => (provider.destroy(), doc.destroy()) };
}

/** Wait until `check` holds, polling. */
export async function eventually(check: () => boolean, what: string, timeoutMs = 10_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (!check()) {
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 50));
  }
}

/** A new paragraph with this text at the end of the report, as an editor's typing would add it. */
export function appendParagraph(doc: Y.Doc, text: string): void {
  const paragraph = new Y.XmlElement('paragraph');
  paragraph.insert(0, [new Y.XmlText(text)]);
  const fragment = doc.getXmlFragment('default');
  fragment.insert(fragment.length, [paragraph]);
}

/** The text node of the report's first heading (the title). */
export function titleText(doc: Y.Doc): Y.XmlText {
  const heading = doc.getXmlFragment('default').get(0) as Y.XmlElement;
  return heading.get(0) as Y.XmlText;
}
