/** Plain text of a scenario's rich text (Tiptap JSON): blocks become paragraphs, hard breaks new lines. */
import type { RichText, RichTextNode } from '../scenario';

const BLOCKS = new Set(['paragraph', 'heading', 'listItem', 'blockquote', 'codeBlock']);

function textOf(node: RichTextNode): string {
  if (node.type === 'text') return node.text ?? '';
  if (node.type === 'hardBreak') return '\n';
  const inner = (node.content ?? []).map(textOf).join('');
  if (node.type === 'listItem') return `• ${inner.trim()}\n`;
  return BLOCKS.has(node.type) ? `${inner.trim()}\n\n` : inner;
}

export function plainText(doc: RichText | undefined | null): string {
  if (!doc) return '';
  return doc.content.map(textOf).join('').replace(/\n{3,}/g, '\n\n').trim();
}
