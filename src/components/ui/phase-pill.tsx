import type { AlertPhase } from "../../../shared/schemas/alerts.js";
import { PHASE_LABELS } from "../../lib/alert-words";

/**
 * The shape that goes with each alert phase, so it reads without colour: an hourglass while the
 * hold-off runs, a bell once people are told, a person with a tick once someone has taken it, a
 * plain tick once it has cleared. Always shown beside the words, so hidden from screen readers.
 */
export function PhaseIcon({ phase, className = "size-6" }: { phase: AlertPhase; className?: string }) {
  return (
    <svg
      viewBox="0 0 24 24"
      fill="none"
      stroke="currentColor"
      strokeWidth={2.25}
      strokeLinecap="round"
      strokeLinejoin="round"
      aria-hidden="true"
      focusable="false"
      data-icon={`phase-${phase}`}
      className={`shrink-0 ${className}`}
    >
      {phase === "watching" && <path d="M7 3h10M7 21h10M8 3c0 4.5 8 5.5 8 9s-8 4.5-8 9M16 3c0 4.5-8 5.5-8 9s8 4.5 8 9" />}
      {phase === "raised" && (
        <>
          <path d="M6 17V11a6 6 0 0 1 12 0v6l1.5 2h-15L6 17Z" />
          <path d="M10 21.5h4" />
        </>
      )}
      {phase === "acknowledged" && (
        <>
          <circle cx="9" cy="7.5" r="3.5" />
          <path d="M2.5 20.5c0-3.9 2.9-7 6.5-7 1.3 0 2.5.4 3.5 1.1" />
          <path d="m14.5 17.5 2.5 2.5 5-5.5" />
        </>
      )}
      {phase === "cleared" && (
        <>
          <circle cx="12" cy="12" r="10" />
          <path d="m7.5 12.5 3 3 6-6.5" />
        </>
      )}
    </svg>
  );
}

/**
 * Raised is the loud one (a solid fill, white text): it needs someone. Watching is a warning
 * outline, acknowledged a calm outline, cleared the in-window green. The words carry the meaning.
 */
const PHASE_CLASSES: Record<AlertPhase, string> = {
  watching: "border-high bg-high-soft text-ink",
  raised: "border-high bg-high text-on-status",
  acknowledged: "border-accent bg-surface text-ink",
  cleared: "border-transparent bg-ok-soft text-ok",
};

type PhasePillProps = { phase: AlertPhase; label?: string; className?: string };

/** An alert's phase as icon + words on a pill. */
export function PhasePill({ phase, label = PHASE_LABELS[phase], className = "" }: PhasePillProps) {
  return (
    <span
      data-phase={phase}
      className={`inline-flex items-center gap-1.5 rounded-full border-2 px-3 py-1 text-base font-bold leading-tight ${PHASE_CLASSES[phase]} ${className}`}
    >
      <PhaseIcon phase={phase} className="size-5" />
      <span>{label}</span>
    </span>
  );
}

/** The same colours for a larger block (a bench card's alert line). */
export const PHASE_BLOCK_CLASSES = PHASE_CLASSES;
