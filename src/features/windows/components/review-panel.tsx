import { useEffect, useRef } from "react";
import type { WindowWarning } from "../../../../shared/schemas/windows.js";
import { Button } from "../../../components/ui/button";
import { WindowWarningList, warningId } from "./window-warnings";

type ReviewPanelProps = {
  warnings: readonly WindowWarning[];
  /** Warnings the saved values already carry; the others are marked "new". */
  savedWarnings: readonly WindowWarning[];
  isSaving: boolean;
  onSaveAnyway: () => void;
  onBack: () => void;
  saveLabel?: string;
};

/**
 * Shown after the dry run when the values leave common guidance: every warning with its source,
 * and the choice to save anyway or go back. Focus moves here so the warnings are read first.
 */
export function ReviewPanel({ warnings, savedWarnings, isSaving, onSaveAnyway, onBack, saveLabel = "Save anyway" }: ReviewPanelProps) {
  const headingRef = useRef<HTMLHeadingElement>(null);
  useEffect(() => headingRef.current?.focus(), []);
  const saved = new Set(savedWarnings.map(warningId));
  return (
    <section aria-labelledby="review-heading" role="region" className="rounded-2xl border-2 border-high bg-high-soft p-4">
      <h3 id="review-heading" ref={headingRef} tabIndex={-1} className="text-xl font-bold">
        Check before saving: {warnings.length === 1 ? "1 warning" : `${warnings.length} warnings`}
      </h3>
      <p className="mb-3 mt-1 text-lg">These values are allowed, but they leave common guidance. Read why, then save anyway or change them.</p>
      <WindowWarningList warnings={warnings} isNew={(w) => !saved.has(warningId(w))} />
      <div className="mt-4 flex flex-wrap gap-3">
        <Button variant="primary" isBusy={isSaving} onClick={onSaveAnyway}>
          {saveLabel}
        </Button>
        <Button onClick={onBack}>Change the values</Button>
      </div>
    </section>
  );
}
