import type { ComponentProps } from "react";

export type ButtonVariant = "primary" | "secondary" | "danger" | "quiet";

const VARIANTS: Record<ButtonVariant, string> = {
  primary: "border-ink bg-ink text-page hover:opacity-90",
  secondary: "border-line bg-surface text-ink hover:border-accent",
  danger: "border-high bg-high text-on-status hover:opacity-90",
  quiet: "border-transparent bg-transparent text-ink underline-offset-4 hover:underline",
};

/** Shared look of every button: a ≥ 44 px touch target with large, bold words. */
export function buttonClasses(variant: ButtonVariant = "secondary", className = ""): string {
  return `inline-flex min-h-touch min-w-touch items-center justify-center gap-2 rounded-lg border-2 px-4 text-lg font-semibold transition-colors disabled:cursor-not-allowed disabled:opacity-60 ${VARIANTS[variant]} ${className}`;
}

type ButtonProps = ComponentProps<"button"> & { variant?: ButtonVariant; isBusy?: boolean };

export function Button({ variant = "secondary", isBusy = false, className = "", type = "button", disabled, children, ...props }: ButtonProps) {
  return (
    <button
      {...props}
      type={type}
      disabled={disabled || isBusy}
      aria-busy={isBusy || undefined}
      className={buttonClasses(variant, className)}
    >
      {isBusy && (
        <span className="size-4 animate-spin rounded-full border-[3px] border-current border-t-transparent" aria-hidden="true" />
      )}
      {children}
    </button>
  );
}
