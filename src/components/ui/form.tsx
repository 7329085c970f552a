import { useId, useState, type ComponentProps, type ReactNode } from "react";

const CONTROL =
  "min-h-touch w-full rounded-lg border-2 border-line bg-surface px-3 py-2 text-lg text-ink placeholder:text-muted aria-[invalid=true]:border-high focus:border-accent";

type FieldFrameProps = {
  id: string;
  label: string;
  hint?: ReactNode;
  error?: string;
  children: ReactNode;
  className?: string;
};

/** Label, hint and error around one control; the error is tied to the control by aria-describedby. */
function FieldFrame({ id, label, hint, error, children, className = "" }: FieldFrameProps) {
  return (
    <div className={`flex flex-col gap-1 ${className}`}>
      <label htmlFor={id} className="text-lg font-semibold">
        {label}
      </label>
      {hint && (
        <p id={`${id}-hint`} className="text-base text-muted">
          {hint}
        </p>
      )}
      {children}
      {error && (
        <p id={`${id}-error`} className="flex items-start gap-1 text-base font-semibold text-high">
          <span aria-hidden="true">!</span>
          {error}
        </p>
      )}
    </div>
  );
}

function describedBy(id: string, hint: unknown, error: unknown): string | undefined {
  const ids = [hint ? `${id}-hint` : null, error ? `${id}-error` : null].filter(Boolean);
  return ids.length > 0 ? ids.join(" ") : undefined;
}

type TextFieldProps = Omit<ComponentProps<"input">, "id"> & {
  label: string;
  hint?: ReactNode;
  error?: string;
  className?: string;
  /** A unit beside a short box ("[20] minutes"); read with the field by screen readers. */
  unit?: string;
};

export function TextField({ label, hint, error, className, unit, ...props }: TextFieldProps) {
  const id = useId();
  const described = [unit ? `${id}-unit` : null, describedBy(id, hint, error)].filter(Boolean).join(" ") || undefined;
  const input = <input {...props} id={id} aria-invalid={error ? true : undefined} aria-describedby={described} className={unit ? CONTROL.replace("w-full", "w-28") : CONTROL} />;
  return (
    <FieldFrame id={id} label={label} hint={hint} error={error} className={className}>
      {unit ? (
        <div className="flex items-center gap-2">
          {input}
          <span id={`${id}-unit`} className="text-lg">
            {unit}
          </span>
        </div>
      ) : (
        input
      )}
    </FieldFrame>
  );
}

type TextAreaFieldProps = Omit<ComponentProps<"textarea">, "id"> & { label: string; hint?: ReactNode; error?: string; className?: string };

/** A few lines of free text (a note). */
export function TextAreaField({ label, hint, error, className, rows = 3, ...props }: TextAreaFieldProps) {
  const id = useId();
  return (
    <FieldFrame id={id} label={label} hint={hint} error={error} className={className}>
      <textarea
        {...props}
        id={id}
        rows={rows}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(id, hint, error)}
        className={CONTROL}
      />
    </FieldFrame>
  );
}

/** A password input with a show/hide toggle (typing on a tablet with wet hands is error-prone). */
export function PasswordField({ label, hint, error, className, ...props }: Omit<TextFieldProps, "type">) {
  const id = useId();
  const [isShown, setIsShown] = useState(false);
  return (
    <FieldFrame id={id} label={label} hint={hint} error={error} className={className}>
      <div className="flex gap-2">
        <input
          {...props}
          id={id}
          type={isShown ? "text" : "password"}
          aria-invalid={error ? true : undefined}
          aria-describedby={describedBy(id, hint, error)}
          className={CONTROL}
        />
        <button
          type="button"
          onClick={() => setIsShown((shown) => !shown)}
          aria-pressed={isShown}
          aria-label={isShown ? `Hide ${label.toLowerCase()}` : `Show ${label.toLowerCase()}`}
          className="min-h-touch min-w-touch shrink-0 rounded-lg border-2 border-line bg-surface px-3 text-base font-semibold text-ink hover:border-accent"
        >
          {isShown ? "Hide" : "Show"}
        </button>
      </div>
    </FieldFrame>
  );
}

type SelectFieldProps = Omit<ComponentProps<"select">, "id"> & { label: string; hint?: ReactNode; error?: string; className?: string };

export function SelectField({ label, hint, error, className, children, ...props }: SelectFieldProps) {
  const id = useId();
  return (
    <FieldFrame id={id} label={label} hint={hint} error={error} className={className}>
      <select
        {...props}
        id={id}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(id, hint, error)}
        className={`${CONTROL} cursor-pointer`}
      >
        {children}
      </select>
    </FieldFrame>
  );
}

type Choice<V extends string> = { value: V; label: string; description?: string };

type ChoiceFieldProps<V extends string> = {
  legend: string;
  name: string;
  value: V;
  options: readonly Choice<V>[];
  onChange: (value: V) => void;
  error?: string;
  className?: string;
};

/** Radio buttons drawn as large cards, each with a line saying what it means. */
export function ChoiceField<V extends string>({ legend, name, value, options, onChange, error, className = "" }: ChoiceFieldProps<V>) {
  const errorId = useId();
  return (
    <fieldset className={`flex flex-col gap-2 ${className}`} aria-describedby={error ? errorId : undefined}>
      <legend className="mb-1 text-lg font-semibold">{legend}</legend>
      <div className="grid gap-2 sm:grid-cols-2">
        {options.map((option) => (
          <label
            key={option.value}
            className="flex min-h-touch cursor-pointer items-start gap-3 rounded-lg border-2 border-line bg-surface p-3 has-[:checked]:border-accent has-[:checked]:bg-page"
          >
            <input
              type="radio"
              name={name}
              value={option.value}
              checked={option.value === value}
              onChange={() => onChange(option.value)}
              className="mt-1 size-5 shrink-0 accent-[var(--bw-accent)]"
            />
            <span>
              <span className="block text-lg font-semibold">{option.label}</span>
              {option.description && <span className="block text-base text-muted">{option.description}</span>}
            </span>
          </label>
        ))}
      </div>
      {error && (
        <p id={errorId} className="text-base font-semibold text-high">
          {error}
        </p>
      )}
    </fieldset>
  );
}
