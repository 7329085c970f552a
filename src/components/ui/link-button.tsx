import type { ComponentProps } from "react";
import { Link } from "react-router-dom";

/** A router link shaped as a ≥ 44 px touch target. */
export function LinkButton({ className = "", ...props }: ComponentProps<typeof Link>) {
  return (
    <Link
      {...props}
      className={`inline-flex min-h-touch items-center gap-2 rounded-lg border-2 border-line bg-surface px-4 text-lg font-semibold text-ink hover:border-accent ${className}`}
    />
  );
}
