/** How far a long analysis has come, with the command to stop it. */
export function ProgressBar({ fraction, phase, onCancel }: { fraction: number; phase: string; onCancel: () => void }) {
  const percent = Math.round(Math.min(1, Math.max(0, fraction)) * 100);
  return (
    <div className="flex items-center gap-3" role="status" aria-live="polite">
      <div className="h-2 flex-1 overflow-hidden rounded bg-ink-100" role="progressbar" aria-valuenow={percent} aria-valuemin={0} aria-valuemax={100} aria-label={`Analysis ${phase}`}>
        <div className="h-full bg-bronze-500 transition-[width]" style={{ width: `${percent}%` }} />
      </div>
      <span className="w-28 truncate text-xs text-ink-600">
        {percent}% · {phase}
      </span>
      <button type="button" className="btn-quiet px-2 py-0.5 text-xs" onClick={onCancel}>
        Cancel
      </button>
    </div>
  );
}
