import type { WindowStatus } from "../../../shared/schemas/windows.js";

/**
 * Tailwind classes per status. Out of window is a solid fill with white text (visible from across
 * the bench); in window and unknown stay quiet so the exceptions stand out.
 */
export const STATUS_SURFACE: Record<WindowStatus, string> = {
  inside: "bg-surface text-ink border-line",
  below: "bg-low text-on-status border-low",
  above: "bg-high text-on-status border-high",
  unknown: "bg-none-soft text-ink border-line",
};

/** Text colour for a status word on a plain surface. */
export const STATUS_TEXT: Record<WindowStatus, string> = {
  inside: "text-ok",
  below: "text-on-status",
  above: "text-on-status",
  unknown: "text-muted",
};

/** A pill for a status on a plain surface (bench header, summary lists). */
export const STATUS_PILL: Record<WindowStatus, string> = {
  inside: "bg-ok-soft text-ok border-transparent",
  below: "bg-low text-on-status border-transparent",
  above: "bg-high text-on-status border-transparent",
  unknown: "bg-none-soft text-muted border-line",
};
