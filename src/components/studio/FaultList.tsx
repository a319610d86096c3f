import type { FieldError } from '../../lib/client/api';

/** Every fault of a document, each with the path where it is. */
export function FaultList({ title, faults, max = 50 }: { title: string; faults: FieldError[]; max?: number }) {
  if (faults.length === 0) return null;
  return (
    <div role="alert" className="rounded-md border border-brick-600 bg-brick-100 px-3 py-2 text-sm text-brick-700" data-testid="fault-list">
      <p className="font-medium">{title}</p>
      <ul className="mt-1 list-disc space-y-0.5 pl-5">
        {faults.slice(0, max).map((f, i) => (
          <li key={`${f.field}-${i}`}>
            <code className="rounded bg-white/70 px-1 font-mono text-xs">{f.field}</code> {f.reason}
          </li>
        ))}
      </ul>
      {faults.length > max && <p className="mt-1">…and {faults.length - max} more.</p>}
    </div>
  );
}
