import { useId } from "react";

type CountFieldProps = {
  label: string;
  value: string;
  onChange: (value: string) => void;
  hint?: string;
  error?: string;
};

/** A whole number typed on the number pad, with − and + beside it (44 px each) for small changes. */
export function CountField({ label, value, onChange, hint, error }: CountFieldProps) {
  const id = useId();
  const current = /^\d+$/.test(value.trim()) ? Number(value.trim()) : null;
  const describedBy = [hint ? `${id}-hint` : null, error ? `${id}-error` : null].filter(Boolean).join(" ") || undefined;
  const step = (delta: number) => onChange(String(Math.max(0, (current ?? 0) + delta)));
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="text-lg font-semibold">
        {label}
      </label>
      {hint && (
        <p id={`${id}-hint`} className="text-base text-muted">
          {hint}
        </p>
      )}
      <div className="flex items-stretch gap-2">
        <button
          type="button"
          onClick={() => step(-1)}
          disabled={current === null || current === 0}
          aria-label={`One fewer ${label.toLowerCase()}`}
          className="min-h-14 min-w-14 rounded-xl border-2 border-line bg-surface text-2xl font-bold text-ink disabled:opacity-50"
        >
          −
        </button>
        <input
          id={id}
          type="text"
          inputMode="numeric"
          autoComplete="off"
          value={value}
          onChange={(e) => onChange(e.target.value)}
          aria-invalid={error ? true : undefined}
          aria-describedby={describedBy}
          placeholder="not counted"
          className="min-h-14 w-full min-w-0 rounded-xl border-2 border-line bg-surface px-3 text-center text-2xl font-bold tabular-nums text-ink placeholder:text-base placeholder:font-normal placeholder:text-muted aria-[invalid=true]:border-high focus:border-accent"
        />
        <button
          type="button"
          onClick={() => step(1)}
          aria-label={`One more ${label.toLowerCase()}`}
          className="min-h-14 min-w-14 rounded-xl border-2 border-line bg-surface text-2xl font-bold text-ink"
        >
          +
        </button>
      </div>
      {error && (
        <p id={`${id}-error`} className="flex items-start gap-1 text-base font-semibold text-high">
          <span aria-hidden="true">!</span>
          {error}
        </p>
      )}
    </div>
  );
}
