/**
 * The analysis nodes in the editor: a figure drawn with the review's charts,
 * a table from its data. Both are atoms: people move or delete them and write
 * around them; their numbers stay as generated.
 */
import { NodeViewWrapper, ReactNodeViewRenderer, type ReactNodeViewProps } from '@tiptap/react';
import { readFigure, readTable } from '../../lib/report/figures';
import { AnalysisFigure, AnalysisTable, reportStarterKit } from '../../lib/report/schema';
import { EscalationChart, RegretChart } from '../review/charts';

function Unreadable({ what }: { what: string }) {
  return <p className="text-sm text-ink-500 italic">This {what} could not be read from the document.</p>;
}

function FigureView({ node }: ReactNodeViewProps) {
  const spec = readFigure(node.attrs.spec);
  return (
    <NodeViewWrapper className="my-4" data-drag-handle>
      <figure data-analysis="figure" className="analysis-figure rounded-md border border-ink-100 bg-white p-2" contentEditable={false}>
        {!spec ? <Unreadable what="figure" /> : spec.kind === 'escalation' ? <EscalationChart spec={spec} height={240} /> : <RegretChart spec={spec} height={220} />}
        {spec && <figcaption className="mt-1">{spec.title}</figcaption>}
      </figure>
    </NodeViewWrapper>
  );
}

function TableView({ node }: ReactNodeViewProps) {
  const spec = readTable(node.attrs.spec);
  return (
    <NodeViewWrapper className="my-4" data-drag-handle>
      <figure data-analysis="table" className="rounded-md border border-ink-100 bg-white p-2" contentEditable={false}>
        {!spec ? (
          <Unreadable what="table" />
        ) : (
          <>
            <figcaption>{spec.title}</figcaption>
            <div className="overflow-x-auto">
              <table>
                <thead>
                  <tr>
                    {spec.columns.map((c, i) => (
                      <th key={i} className={spec.numeric.includes(i) ? 'num' : undefined}>
                        {c}
                      </th>
                    ))}
                  </tr>
                </thead>
                <tbody>
                  {spec.rows.map((row, r) => (
                    <tr key={r}>
                      {row.map((cell, i) => (
                        <td key={i} className={spec.numeric.includes(i) ? 'num' : undefined}>
                          {cell === null ? '—' : String(cell)}
                        </td>
                      ))}
                    </tr>
                  ))}
                  {spec.rows.length === 0 && (
                    <tr>
                      <td colSpan={spec.columns.length} className="text-ink-500 italic">
                        None.
                      </td>
                    </tr>
                  )}
                </tbody>
              </table>
            </div>
            {spec.note && <p className="note mt-1">{spec.note}</p>}
          </>
        )}
      </figure>
    </NodeViewWrapper>
  );
}

/** The report schema's extensions with their browser views. */
export const editorExtensions = [
  reportStarterKit,
  AnalysisFigure.extend({ addNodeView: () => ReactNodeViewRenderer(FigureView) }),
  AnalysisTable.extend({ addNodeView: () => ReactNodeViewRenderer(TableView) }),
];
