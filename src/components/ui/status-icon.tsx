import type { WindowStatus } from "../../../shared/schemas/windows.js";

type StatusIconProps = { status: WindowStatus; className?: string };

/**
 * The shape that goes with each status, so it reads without colour: a tick for in window, an
 * arrow down for below, an arrow up for above, a dash for nothing known. Always shown beside
 * the status words, so it is hidden from screen readers.
 */
export function StatusIcon({ status, className = "size-6" }: StatusIconProps) {
  return (
    <svg
      viewBox="0 0 24 24"
      fill="none"
      stroke="currentColor"
      strokeWidth={2.75}
      strokeLinecap="round"
      strokeLinejoin="round"
      aria-hidden="true"
      focusable="false"
      data-icon={status}
      className={`shrink-0 ${className}`}
    >
      <circle cx="12" cy="12" r="10" strokeWidth={2.25} />
      {status === "inside" && <path d="m7.5 12.5 3 3 6-6.5" />}
      {status === "below" && <path d="M12 6.5v10m-4.5-4.5 4.5 4.5 4.5-4.5" />}
      {status === "above" && <path d="M12 17.5v-10m-4.5 4.5 4.5-4.5 4.5 4.5" />}
      {status === "unknown" && <path d="M8 12h8" />}
    </svg>
  );
}
