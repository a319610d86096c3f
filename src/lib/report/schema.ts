/**
 * The report document's schema, shared by the browser editor and the server
 * (draft generation, issue, export). Tiptap's starter kit plus two atom nodes
 * that carry analysis as data: a figure (a chart) and a table. The browser
 * extends them with React views; the server uses them as they are.
 */
import { getSchema, mergeAttributes, Node, type JSONContent } from '@tiptap/core';
import StarterKit from '@tiptap/starter-kit';

export type { JSONContent };

/** The Y.XmlFragment of the Yjs document that holds the report (Tiptap's default field). */
export const REPORT_FIELD = 'default';

function analysisNode(name: string, tag: string, marker: string) {
  return Node.create({
    name,
    group: 'block',
    atom: true,
    selectable: true,
    draggable: true,
    addAttributes() {
      return {
        spec: {
          default: '{}',
          parseHTML: (element: HTMLElement) => element.getAttribute('data-spec') ?? '{}',
          renderHTML: (attributes: { spec?: string }) => ({ 'data-spec': attributes.spec ?? '{}' }),
        },
      };
    },
    parseHTML() {
      return [{ tag: `${tag}[${marker}]` }];
    },
    renderHTML({ HTMLAttributes }) {
      return [tag, mergeAttributes(HTMLAttributes, { [marker]: '' })];
    },
  });
}

export const AnalysisFigure = analysisNode('analysisFigure', 'figure', 'data-analysis-figure');
export const AnalysisTable = analysisNode('analysisTable', 'div', 'data-analysis-table');

/** Undo is the collaboration extension's, per user; the starter kit's own history would undo others' typing. */
export const reportStarterKit = StarterKit.configure({ undoRedo: false, link: { openOnClick: false } });

export const reportExtensions = [reportStarterKit, AnalysisFigure, AnalysisTable];

let schema: ReturnType<typeof getSchema> | null = null;

export function reportSchema() {
  schema ??= getSchema(reportExtensions);
  return schema;
}
