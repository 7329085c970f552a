import type { WindowStatus } from "../../../shared/schemas/windows.js";
import { StatusIcon } from "./status-icon";
import { STATUS_PILL } from "./status-tone";

type StatusPillProps = { status: WindowStatus; label: string; className?: string };

/** A status as icon + words on a coloured pill; the words carry the meaning, the colour repeats it. */
export function StatusPill({ status, label, className = "" }: StatusPillProps) {
  return (
    <span
      data-status={status}
      className={`inline-flex items-center gap-1.5 rounded-full border px-3 py-1 text-base font-bold leading-tight ${STATUS_PILL[status]} ${className}`}
    >
      <StatusIcon status={status} className="size-5" />
      <span>{label}</span>
    </span>
  );
}
