import type { ComponentProps } from "react";
import { Link } from "react-router-dom";
import { buttonClasses, type ButtonVariant } from "./button";

/** A router link shaped as a ≥ 44 px touch target, in the same looks as Button. */
export function LinkButton({ className = "", variant = "secondary", ...props }: ComponentProps<typeof Link> & { variant?: ButtonVariant }) {
  return <Link {...props} className={buttonClasses(variant, className)} />;
}
