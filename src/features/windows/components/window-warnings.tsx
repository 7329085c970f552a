import type { WindowWarning } from "../../../../shared/schemas/windows.js";
import { QUANTITY_LABELS } from "../../../lib/quantity-labels";
import { FIELD_LABELS } from "../utils/window-values";

const BASIS_WORDS: Record<WindowWarning["source"]["basis"], string> = {
  published: "Published source",
  "common-practice": "Common practice",
  benchwarden: "How Benchwarden works",
};

/** "Air temperature · Minimum", or "Dew-point margin". */
export function warningPlace(warning: Pick<WindowWarning, "quantity" | "field">): string {
  const field = FIELD_LABELS[warning.field];
  return warning.quantity ? `${QUANTITY_LABELS[warning.quantity]} · ${field}` : field;
}

type WindowWarningListProps = {
  warnings: readonly WindowWarning[];
  /** Codes (with their quantity) that the saved values do not have yet: marked "new". */
  isNew?: (warning: WindowWarning) => boolean;
};

/**
 * Guidance warnings, each with where it points, what it says and where the guidance comes from
 * (citation and the reference it rests on). They never block a save.
 */
export function WindowWarningList({ warnings, isNew }: WindowWarningListProps) {
  return (
    <ul className="flex flex-col gap-3">
      {warnings.map((w) => (
        <li key={`${w.code}-${w.quantity ?? "margin"}`} data-warning={w.code} className="rounded-xl border-2 border-high bg-surface p-3">
          <p className="flex flex-wrap items-baseline gap-x-2 font-bold">
            <span aria-hidden="true" className="text-high">
              ⚠
            </span>
            {warningPlace(w)}
            {isNew?.(w) && <span className="rounded-full bg-high px-2 text-base text-on-status">new</span>}
          </p>
          <p className="mt-1">{w.message}</p>
          <p className="mt-2 text-base text-muted">
            {/* The citation is for people; the source's place in our own notes (reference) stays in the data. */}
            <span className="font-semibold">{BASIS_WORDS[w.source.basis]}:</span> {w.source.citation}
          </p>
        </li>
      ))}
    </ul>
  );
}

export function warningId(w: Pick<WindowWarning, "code" | "quantity">): string {
  return `${w.code}|${w.quantity ?? ""}`;
}
