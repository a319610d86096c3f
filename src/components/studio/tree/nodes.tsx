/** The canvas's node shapes: a decision (the team to move), a chance node, an outcome. */
import { Handle, Position, type NodeProps, type Node } from '@xyflow/react';
import { memo } from 'react';

export type CanvasNodeData = {
  kind: 'decision' | 'chance' | 'terminal';
  title: string;
  lines: string[];
  /** Index of the moving team, for its colour when the scenario gives none. */
  teamIndex: number;
  colour?: string;
  onPath: boolean;
  collapsed: boolean;
  hidden: number;
};

export type CanvasNode = Node<CanvasNodeData>;

/** Team colours from our palette, by the team's position in the scenario. */
export const TEAM_STRIPES = ['bg-haze-700', 'bg-brick-600', 'bg-moss-600', 'bg-bronze-600', 'bg-ink-600', 'bg-ink-400'];

const handle = { opacity: 0, width: 1, height: 1, minWidth: 0, minHeight: 0, border: 0 };

function frame(data: CanvasNodeData, selected: boolean): string {
  const ring = selected ? 'ring-3 ring-bronze-500' : '';
  const border = data.onPath ? 'border-bronze-600 border-2' : 'border-ink-300 border';
  return `${ring} ${border}`;
}

function Hidden({ data }: { data: CanvasNodeData }) {
  if (!data.collapsed) return null;
  return <span className="tag absolute -right-2 -top-2 bg-ink-900 text-paper">+{data.hidden}</span>;
}

function DecisionShape({ data, selected }: NodeProps<CanvasNode>) {
  return (
    <div className={`relative flex h-full w-full overflow-hidden rounded-md bg-white text-left ${frame(data, selected)}`} data-kind="decision" data-on-path={data.onPath || undefined}>
      <Handle type="target" position={Position.Left} style={handle} isConnectable={false} />
      <span className={`w-1.5 shrink-0 ${data.colour ? '' : TEAM_STRIPES[data.teamIndex % TEAM_STRIPES.length]}`} style={data.colour ? { background: data.colour } : undefined} aria-hidden="true" />
      <span className="min-w-0 px-2 py-1.5">
        <span className="block truncate text-sm font-semibold text-ink-900">{data.title}</span>
        {data.lines.map((line) => (
          <span key={line} className="block truncate text-xs text-ink-600">
            {line}
          </span>
        ))}
      </span>
      <Handle type="source" position={Position.Right} style={handle} isConnectable={false} />
      <Hidden data={data} />
    </div>
  );
}

function ChanceShape({ data, selected }: NodeProps<CanvasNode>) {
  return (
    <div className={`relative flex h-full w-full items-center justify-center rounded-full bg-paper-deep text-sm font-medium text-ink-800 ${frame(data, selected)}`} data-kind="chance">
      <Handle type="target" position={Position.Left} style={handle} isConnectable={false} />
      {data.title}
      <Handle type="source" position={Position.Right} style={handle} isConnectable={false} />
      <Hidden data={data} />
    </div>
  );
}

function TerminalShape({ data, selected }: NodeProps<CanvasNode>) {
  return (
    <div className={`relative h-full w-full rounded-md bg-paper px-2 py-1 ${frame(data, selected)}`} data-kind="terminal">
      <Handle type="target" position={Position.Left} style={handle} isConnectable={false} />
      <span className="block truncate text-xs font-semibold text-ink-800" title={data.title}>
        {data.title}
      </span>
      {data.lines.map((line) => (
        <span key={line} className="block truncate font-mono text-[11px] leading-4 text-ink-700">
          {line}
        </span>
      ))}
    </div>
  );
}

export const NODE_TYPES = { decision: memo(DecisionShape), chance: memo(ChanceShape), terminal: memo(TerminalShape) };
