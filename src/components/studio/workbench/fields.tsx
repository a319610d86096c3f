/** Small controlled inputs that keep what the author typed, even when it is not valid yet. */
import { useEffect, useId, useState } from 'react';
import { toFloat, type Num } from '../../../lib/engine';
import { NUM_HINT, numText, parseNum } from './format';

type NumFieldProps = {
  label: string;
  value: Num | undefined;
  onChange: (value: Num) => void;
  /** Allow clearing the field (onClear is called with an empty box). */
  onClear?: () => void;
  readOnly?: boolean;
  className?: string;
  /** Show the label to sighted users too (default: only to screen readers). */
  showLabel?: boolean;
  min?: number;
  max?: number;
  integer?: boolean;
  placeholder?: string;
};

function sameValue(a: Num | null, b: Num | undefined): boolean {
  if (a === null || b === undefined) return a === null && b === undefined;
  return toFloat(a) === toFloat(b);
}

/** A number cell: "3", "-1.5" or "2/3". A bad entry stays in the box with the reason beside it. */
export function NumField({ label, value, onChange, onClear, readOnly, className = '', showLabel = false, min, max, integer, placeholder }: NumFieldProps) {
  const id = useId();
  const [text, setText] = useState(numText(value));
  const [error, setError] = useState<string | null>(null);
  // Take a new value from outside (undo, another cell), but never rewrite what is being typed ("1.50").
  useEffect(() => {
    setText((typed) => (sameValue(parseNum(typed), value) ? typed : numText(value)));
  }, [value]);
  const commit = (next: string) => {
    setText(next);
    if (next.trim() === '' && onClear) {
      setError(null);
      onClear();
      return;
    }
    const parsed = parseNum(next);
    const float = parsed === null ? NaN : toFloat(parsed);
    const reason =
      parsed === null
        ? `must be ${NUM_HINT}`
        : integer && !Number.isInteger(float)
          ? 'must be a whole number'
          : min !== undefined && float < min
            ? `must be at least ${min}`
            : max !== undefined && float > max
              ? `must be at most ${max}`
              : null;
    setError(reason);
    if (reason === null && parsed !== null) onChange(integer ? Math.round(float) : parsed);
  };
  return (
    <span className={`inline-block ${className}`}>
      <label htmlFor={id} className={showLabel ? 'field-label' : 'sr-only'}>
        {label}
      </label>
      <input
        id={id}
        className={`field-input px-2 py-1 font-mono text-xs ${error ? 'border-brick-600' : ''}`}
        value={text}
        inputMode="decimal"
        placeholder={placeholder}
        readOnly={readOnly}
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? `${id}-error` : undefined}
        onChange={(e) => commit(e.target.value)}
      />
      {error && (
        <span id={`${id}-error`} className="mt-0.5 block text-xs text-brick-700" role="alert">
          {error}
        </span>
      )}
    </span>
  );
}

type TextFieldProps = {
  label: string;
  value: string;
  onChange: (value: string) => void;
  readOnly?: boolean;
  multiline?: boolean;
  required?: boolean;
  showLabel?: boolean;
  className?: string;
  maxLength?: number;
  hint?: string;
};

export function TextField({ label, value, onChange, readOnly, multiline, required, showLabel = true, className = '', maxLength, hint }: TextFieldProps) {
  const id = useId();
  const error = required && value.trim() === '' ? 'must not be empty' : null;
  const common = {
    id,
    value,
    readOnly,
    maxLength,
    'aria-invalid': error ? true : undefined,
    'aria-describedby': error ? `${id}-error` : hint ? `${id}-hint` : undefined,
    className: `field-input ${error ? 'border-brick-600' : ''}`,
  };
  return (
    <div className={className}>
      <label htmlFor={id} className={showLabel ? 'field-label' : 'sr-only'}>
        {label}
      </label>
      {multiline ? <textarea rows={3} {...common} onChange={(e) => onChange(e.target.value)} /> : <input {...common} onChange={(e) => onChange(e.target.value)} />}
      {hint && !error && (
        <p id={`${id}-hint`} className="mt-1 text-xs text-ink-500">
          {hint}
        </p>
      )}
      {error && (
        <p id={`${id}-error`} className="field-error" role="alert">
          {label} {error}
        </p>
      )}
    </div>
  );
}

/** The caution every analysis result carries (the Astro Caution component, for islands). */
export function AnalysisCaution() {
  return (
    <p className="text-xs text-ink-600" data-caution>
      Follows from the payoffs assumed in this scenario: an aid to discussion, not a prediction of what any government will do.
    </p>
  );
}
