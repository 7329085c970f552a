import type { ReactNode } from "react";

/** A large on/off button (aria-pressed) for wet fingers: a tick and a solid fill when on, never colour alone. */
export function ToggleButton({ isOn, onToggle, children, disabled }: { isOn: boolean; onToggle: () => void; children: ReactNode; disabled?: boolean }) {
  return (
    <button
      type="button"
      aria-pressed={isOn}
      disabled={disabled}
      onClick={onToggle}
      className={`flex min-h-14 w-full items-center gap-2 rounded-xl border-2 px-3 text-left text-lg font-semibold leading-tight transition-colors disabled:opacity-60 ${
        isOn ? "border-ink bg-ink text-page" : "border-line bg-surface text-ink"
      }`}
    >
      <span
        aria-hidden="true"
        className={`flex size-7 shrink-0 items-center justify-center rounded-md border-2 text-base ${isOn ? "border-page" : "border-muted"}`}
      >
        {isOn ? "✓" : ""}
      </span>
      <span>{children}</span>
    </button>
  );
}
