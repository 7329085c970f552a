import { useRef, useState, type FormEvent } from "react";
import { Link } from "react-router-dom";
import type { TemperatureUnit } from "../../../../shared/domain/units.js";
import { WINDOWED_QUANTITIES } from "../../../../shared/schemas/quantities.js";
import { zoneWindowsInputSchema, type WindowWarning, type ZoneWindowsInput, type ZoneWindowsResponse } from "../../../../shared/schemas/windows.js";
import { Button } from "../../../components/ui/button";
import { Notice } from "../../../components/ui/notice";
import { useToast } from "../../../components/ui/toast";
import { paths } from "../../../config/paths";
import { ALLOWED, useAuthorization } from "../../../lib/authorization";
import { focusFirstInvalid } from "../../../lib/form";
import { QUANTITY_LABELS } from "../../../lib/quantity-labels";
import { useTemperatureUnit } from "../../../lib/temperature-unit";
import { useSaveZoneWindows } from "../api/save-zone-windows";
import { NO_WINDOW_ERRORS, windowErrorsFromApi, type WindowFormErrors } from "../utils/window-errors";
import { draftWindows, marginSi, placeWindowIssues, windowSetDraft, zodIssues, type QuantityDraft, type WindowSetDraft } from "../utils/window-values";
import { ReadOnlyNotice } from "./read-only-notice";
import { ReviewPanel } from "./review-panel";
import { MarginField, QuantityFieldset } from "./window-fields";
import { WindowSetView } from "./window-set-view";
import { WindowWarningList } from "./window-warnings";

/**
 * A zone's rooting window, per quantity, in the reader's unit. Managers and admins edit it: the
 * shared schema checks the values first, a dry run asks the server for guidance warnings, and
 * any warnings are shown with their sources before the save. Other roles read the same values.
 */
export function ZoneWindowEditor({ data }: { data: ZoneWindowsResponse }) {
  const { unit } = useTemperatureUnit();
  const { isAllowed } = useAuthorization();
  const canEdit = isAllowed(ALLOWED.manageGrowing);

  return (
    <div className="flex flex-col gap-4">
      {data.benchOverrides.length > 0 && <BenchOverridesNote data={data} />}
      {!canEdit ? (
        <>
          <ReadOnlyNotice what="this zone's windows" />
          <ZoneWindowView data={data} unit={unit} />
          <SavedWarnings warnings={data.warnings} />
        </>
      ) : data.zone.archived ? (
        <>
          <Notice tone="info" title="Archived zone">
            Restore the zone to change its windows.
          </Notice>
          <ZoneWindowView data={data} unit={unit} />
        </>
      ) : (
        // A new unit or newly saved values start the form afresh.
        <ZoneWindowForm key={`${unit}|${JSON.stringify([data.windows, data.dewPointMarginC])}`} data={data} unit={unit} />
      )}
    </div>
  );
}

function ZoneWindowView({ data, unit }: { data: ZoneWindowsResponse; unit: TemperatureUnit }) {
  return (
    <WindowSetView
      caption={`Rooting window of ${data.zone.name}`}
      rows={WINDOWED_QUANTITIES.map((q) => ({ quantity: q, window: data.windows.find((w) => w.quantity === q) ?? null }))}
      margin={{ valueC: data.dewPointMarginC }}
      unit={unit}
    />
  );
}

function SavedWarnings({ warnings }: { warnings: readonly WindowWarning[] }) {
  if (warnings.length === 0) return null;
  return (
    <section aria-labelledby="saved-warnings-heading" className="flex flex-col gap-2">
      <h3 id="saved-warnings-heading" className="text-lg font-bold">
        Where the saved windows leave common guidance
      </h3>
      <WindowWarningList warnings={warnings} />
    </section>
  );
}

function BenchOverridesNote({ data }: { data: ZoneWindowsResponse }) {
  return (
    <Notice tone="info" title="Benches with windows of their own">
      <p>These benches keep their own values for what they override; everything else follows the zone.</p>
      <ul className="mt-2 flex flex-col gap-1">
        {data.benchOverrides.map((b) => {
          const what = [...b.quantities.map((q) => QUANTITY_LABELS[q].toLowerCase()), ...(b.dewPointMarginC !== null ? ["dew-point margin"] : [])];
          return (
            <li key={b.benchId}>
              <Link to={paths.settingsBench.to(b.benchId)} className="font-semibold text-accent underline underline-offset-4">
                {b.benchName}
              </Link>
              : {what.join(", ")}
            </li>
          );
        })}
      </ul>
    </Notice>
  );
}

type Review = { input: ZoneWindowsInput; warnings: WindowWarning[] };

function ZoneWindowForm({ data, unit }: { data: ZoneWindowsResponse; unit: TemperatureUnit }) {
  const formRef = useRef<HTMLFormElement>(null);
  const initial = useRef<WindowSetDraft>(windowSetDraft(data.windows, data.dewPointMarginC, unit));
  const [draft, setDraft] = useState<WindowSetDraft>(initial.current);
  const [errors, setErrors] = useState<WindowFormErrors>(NO_WINDOW_ERRORS);
  const [review, setReview] = useState<Review | null>(null);
  const save = useSaveZoneWindows();
  const { showToast } = useToast();
  const zoneId = data.zone.id;
  const isChanged = draft !== initial.current;

  function editQuantity(next: QuantityDraft) {
    setDraft((d) => ({ ...d, quantities: d.quantities.map((q) => (q.quantity === next.quantity ? next : q)) }));
    setReview(null);
    setErrors((e) => ({ form: null, fields: Object.fromEntries(Object.entries(e.fields).filter(([k]) => !k.startsWith(`${next.quantity}.`))) }));
  }

  // mutateAsync, not mutate's callbacks: a save replaces the stored values, which remounts this
  // form with them, and TanStack drops the callbacks of a component that has unmounted.
  async function commit(input: ZoneWindowsInput) {
    try {
      const saved = await save.mutateAsync({ zoneId, input, dryRun: false });
      setReview(null);
      showToast(saved.changed ? `Windows saved for ${data.zone.name}` : "Nothing to save: these are the stored values", saved.changed ? "success" : "info");
    } catch (error) {
      setReview(null);
      setErrors(windowErrorsFromApi(error, input.windows.map((w) => w.quantity)));
      focusFirstInvalid(formRef.current);
    }
  }

  function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const windows = draftWindows(draft, unit);
    const quantities = windows.map((w) => w.quantity);
    // The values checked are the SI values sent: the same schema the server parses the body with.
    const parsed = zoneWindowsInputSchema.safeParse({ windows, dewPointMarginC: marginSi(draft.margin, unit) });
    if (!parsed.success) {
      setErrors(placeWindowIssues(zodIssues(parsed.error), quantities));
      focusFirstInvalid(formRef.current);
      return;
    }
    setErrors(NO_WINDOW_ERRORS);
    const input = parsed.data;
    save.mutate(
      { zoneId, input, dryRun: true },
      {
        onSuccess: (answer) => {
          if (!answer.changed) {
            showToast("Nothing to save: these are the stored values", "info");
            return;
          }
          if (answer.warnings.length > 0) {
            setReview({ input, warnings: answer.warnings });
            return;
          }
          void commit(input);
        },
        onError: (error) => {
          setErrors(windowErrorsFromApi(error, quantities));
          focusFirstInvalid(formRef.current);
        },
      },
    );
  }

  return (
    <form ref={formRef} onSubmit={onSubmit} noValidate aria-label={`Rooting window of ${data.zone.name}`} className="flex flex-col gap-4">
      <p className="text-lg text-muted">
        Values in your unit ({unit === "F" ? "°F" : "°C"}). The hold-off delay is how long a value may stay out before an alert is raised; the clearing band is how far back
        inside the window it must come before the alert clears. Changes take effect at the next evaluation.
      </p>
      {errors.form && <Notice tone="error">{errors.form}</Notice>}
      {draft.quantities.map((q) => (
        <QuantityFieldset key={q.quantity} draft={q} unit={unit} errors={errors.fields} onChange={editQuantity} canSwitchOff />
      ))}
      <fieldset className="rounded-2xl border-2 border-line bg-surface p-4">
        <legend className="px-1 text-xl font-bold">Condensation</legend>
        <MarginField
          draft={draft.margin}
          unit={unit}
          error={errors.fields.dewPointMarginC}
          onChange={(margin) => {
            setDraft((d) => ({ ...d, margin }));
            setReview(null);
          }}
        />
      </fieldset>
      {review ? (
        <ReviewPanel
          warnings={review.warnings}
          savedWarnings={data.warnings}
          isSaving={save.isPending}
          onSaveAnyway={() => void commit(review.input)}
          onBack={() => {
            setReview(null);
            formRef.current?.querySelector<HTMLInputElement>("input[inputmode='decimal']")?.focus();
          }}
        />
      ) : (
        <div className="flex flex-wrap gap-3">
          <Button type="submit" variant="primary" isBusy={save.isPending}>
            Check and save
          </Button>
          <Button
            disabled={!isChanged}
            onClick={() => {
              setDraft(initial.current);
              setErrors(NO_WINDOW_ERRORS);
            }}
          >
            Undo my changes
          </Button>
        </div>
      )}
      {!review && <SavedWarnings warnings={data.warnings} />}
    </form>
  );
}
