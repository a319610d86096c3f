import type { ReactNode } from 'react';

type FieldProps = { id: string; label: string; error?: string; hint?: string; children: ReactNode };

/** A labelled form control with its hint and error, wired for screen readers. */
export function Field({ id, label, error, hint, children }: FieldProps) {
  return (
    <div>
      <label htmlFor={id} className="field-label">
        {label}
      </label>
      {children}
      {hint && !error && (
        <p id={`${id}-hint`} className="mt-1 text-xs text-ink-500">
          {hint}
        </p>
      )}
      {error && (
        <p id={`${id}-error`} className="field-error" role="alert">
          {error}
        </p>
      )}
    </div>
  );
}

export function FormMessage({ tone, children }: { tone: 'error' | 'ok'; children: ReactNode }) {
  const styles = tone === 'error' ? 'border-brick-600 bg-brick-100 text-brick-700' : 'border-moss-600 bg-moss-100 text-moss-700';
  return (
    <div role={tone === 'error' ? 'alert' : 'status'} className={`rounded-md border px-3 py-2 text-sm ${styles}`}>
      {children}
    </div>
  );
}
