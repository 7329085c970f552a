import { useRef, useState, type FormEvent } from "react";
import type { TemperatureUnit } from "../../../../shared/domain/units.js";
import type { WindowedQuantity } from "../../../../shared/schemas/quantities.js";
import { benchWindowsInputSchema, type BenchWindowsInput, type BenchWindowsResponse, type QuantityWindow, type WindowWarning } from "../../../../shared/schemas/windows.js";
import { Button } from "../../../components/ui/button";
import { Notice } from "../../../components/ui/notice";
import { useToast } from "../../../components/ui/toast";
import { ALLOWED, useAuthorization } from "../../../lib/authorization";
import { focusFirstInvalid } from "../../../lib/form";
import { QUANTITY_LABELS } from "../../../lib/quantity-labels";
import { useTemperatureUnit } from "../../../lib/temperature-unit";
import { useSaveBenchWindows } from "../api/save-bench-windows";
import { NO_WINDOW_ERRORS, windowErrorsFromApi, type WindowFormErrors } from "../utils/window-errors";
import {
  FIELD_LABELS,
  LIMIT_FIELDS,
  differingFields,
  draftWindow,
  formatFieldValue,
  formatMargin,
  formatMarginInput,
  marginSi,
  placeWindowIssues,
  quantityDraft,
  zodIssues,
  type FieldDraft,
  type QuantityDraft,
} from "../utils/window-values";
import { ReadOnlyNotice } from "./read-only-notice";
import { ReviewPanel } from "./review-panel";
import { MarginField, QuantityFieldset } from "./window-fields";
import { WindowSetView } from "./window-set-view";
import { WindowWarningList } from "./window-warnings";

/**
 * A bench's overrides of its zone's windows. Each quantity either follows the zone or has the
 * bench's own window, whose fields that differ from the zone's are marked; "Go back to the zone's
 * window" drops an override. Saving works as for a zone: schema, dry run, warnings, save.
 */
export function BenchWindowEditor({ data }: { data: BenchWindowsResponse }) {
  const { unit } = useTemperatureUnit();
  const { isAllowed } = useAuthorization();
  const canEdit = isAllowed(ALLOWED.manageGrowing) && !data.bench.archived;
  return (
    <div className="flex flex-col gap-4">
      {!isAllowed(ALLOWED.manageGrowing) && <ReadOnlyNotice what="this bench's windows" />}
      {data.bench.archived && (
        <Notice tone="info" title="Archived bench">
          Restore the bench to change its windows.
        </Notice>
      )}
      {canEdit ? (
        <BenchWindowForm key={`${unit}|${JSON.stringify(data.overrides)}|${JSON.stringify(data.zone)}`} data={data} unit={unit} />
      ) : (
        <>
          <BenchWindowView data={data} unit={unit} />
          {data.warnings.length > 0 && <WindowWarningList warnings={data.warnings} />}
        </>
      )}
    </div>
  );
}

/** The windows in force on the bench as text, with where each comes from and what differs from the zone. */
export function BenchWindowView({ data, unit }: { data: BenchWindowsResponse; unit: TemperatureUnit }) {
  return (
    <WindowSetView
      caption={`Windows in force on ${data.bench.name}`}
      rows={data.effective.map((e) => ({ quantity: e.quantity, window: e.window, source: e.source, differingFields: e.differingFields }))}
      margin={{ valueC: data.dewPointMargin.valueC, source: data.dewPointMargin.source, differsFromZone: data.dewPointMargin.differsFromZone }}
      unit={unit}
    />
  );
}

type Mode = "zone" | "bench";
type QuantityChoice = { mode: Mode; draft: QuantityDraft };
type Draft = { quantities: QuantityChoice[]; margin: { mode: Mode; draft: FieldDraft } };

function initialDraft(data: BenchWindowsResponse, unit: TemperatureUnit): Draft {
  return {
    quantities: data.effective.map((e) => {
      const own = data.overrides.windows.find((w) => w.quantity === e.quantity);
      // A quantity that follows the zone starts from the zone's values if the bench gets its own.
      return { mode: own ? "bench" : "zone", draft: quantityDraft(e.quantity, own ?? e.zoneWindow, unit, true) };
    }),
    margin: {
      mode: data.overrides.dewPointMarginC === null ? "zone" : "bench",
      draft: (() => {
        const c = data.overrides.dewPointMarginC ?? data.zone.dewPointMarginC;
        const text = formatMarginInput(c, unit);
        return { text, initialText: text, initialSi: c };
      })(),
    },
  };
}

function differsWords(fields: readonly string[]): string {
  return fields.map((f) => FIELD_LABELS[f as keyof typeof FIELD_LABELS].toLowerCase()).join(", ");
}

type Review = { input: BenchWindowsInput; warnings: WindowWarning[] };

function BenchWindowForm({ data, unit }: { data: BenchWindowsResponse; unit: TemperatureUnit }) {
  const formRef = useRef<HTMLFormElement>(null);
  const initial = useRef<Draft>(initialDraft(data, unit));
  const [draft, setDraft] = useState<Draft>(initial.current);
  const [errors, setErrors] = useState<WindowFormErrors>(NO_WINDOW_ERRORS);
  const [review, setReview] = useState<Review | null>(null);
  const save = useSaveBenchWindows();
  const { showToast } = useToast();
  const benchId = data.bench.id;
  const zoneWindowOf = (q: WindowedQuantity): QuantityWindow | null => data.zone.windows.find((w) => w.quantity === q) ?? null;

  function update(change: (d: Draft) => Draft) {
    setDraft(change);
    setReview(null);
  }

  function setMode(quantity: WindowedQuantity, mode: Mode) {
    update((d) => ({ ...d, quantities: d.quantities.map((c) => (c.draft.quantity === quantity ? { ...c, mode } : c)) }));
    setErrors((e) => ({ form: null, fields: Object.fromEntries(Object.entries(e.fields).filter(([k]) => !k.startsWith(`${quantity}.`))) }));
  }

  function buildInput(): { input: BenchWindowsInput; quantities: WindowedQuantity[] } {
    const windows = draft.quantities.filter((c) => c.mode === "bench").map((c) => draftWindow(c.draft, unit));
    return {
      input: { windows, dewPointMarginC: draft.margin.mode === "bench" ? marginSi(draft.margin.draft, unit) : null },
      quantities: windows.map((w) => w.quantity),
    };
  }

  // mutateAsync, not mutate's callbacks: a save remounts this form with the stored values, and
  // TanStack drops the callbacks of a component that has unmounted.
  async function commit(input: BenchWindowsInput) {
    try {
      const saved = await save.mutateAsync({ benchId, input, dryRun: false });
      setReview(null);
      const followsZone = saved.overrides.windows.length === 0 && saved.overrides.dewPointMarginC === null;
      showToast(
        !saved.changed ? "Nothing to save: these are the stored values" : followsZone ? `${data.bench.name} follows its zone again` : `Windows saved for ${data.bench.name}`,
        saved.changed ? "success" : "info",
      );
    } catch (error) {
      setReview(null);
      setErrors(windowErrorsFromApi(error, input.windows.map((w) => w.quantity)));
      focusFirstInvalid(formRef.current);
    }
  }

  function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const { input: values, quantities } = buildInput();
    const parsed = benchWindowsInputSchema.safeParse(values);
    if (!parsed.success) {
      setErrors(placeWindowIssues(zodIssues(parsed.error), quantities));
      focusFirstInvalid(formRef.current);
      return;
    }
    setErrors(NO_WINDOW_ERRORS);
    const input = parsed.data;
    save.mutate(
      { benchId, input, dryRun: true },
      {
        onSuccess: (answer) => {
          if (!answer.changed) return showToast("Nothing to save: these are the stored values", "info");
          if (answer.warnings.length > 0) return setReview({ input, warnings: answer.warnings });
          void commit(input);
        },
        onError: (error) => {
          setErrors(windowErrorsFromApi(error, quantities));
          focusFirstInvalid(formRef.current);
        },
      },
    );
  }

  const hasOwn = draft.quantities.some((c) => c.mode === "bench") || draft.margin.mode === "bench";

  return (
    <form ref={formRef} onSubmit={onSubmit} noValidate aria-label={`Windows of ${data.bench.name}`} className="flex flex-col gap-4">
      <p className="text-lg text-muted">
        Each quantity follows the zone ({data.bench.zoneName}) unless this bench has its own window. Values in your unit ({unit === "F" ? "°F" : "°C"}).
      </p>
      {errors.form && <Notice tone="error">{errors.form}</Notice>}
      {draft.quantities.map((choice) => {
        const q = choice.draft.quantity;
        const zoneWindow = zoneWindowOf(q);
        const label = QUANTITY_LABELS[q];
        if (choice.mode === "zone") {
          return (
            <fieldset key={q} data-quantity={q} data-source="zone" className="rounded-2xl border-2 border-line bg-surface p-4">
              <legend className="px-1 text-xl font-bold">{label}</legend>
              <p className="text-lg">
                <span className="mr-2 rounded-full bg-ok-soft px-3 py-0.5 font-semibold text-ok">Follows the zone</span>
                {zoneWindow ? LIMIT_FIELDS.map((f) => `${FIELD_LABELS[f]} ${formatFieldValue(q, f, zoneWindow[f], unit)}`).join(" · ") : "The zone does not watch this."}
              </p>
              <Button className="mt-3" onClick={() => setMode(q, "bench")}>
                Give this bench its own {label.toLowerCase()} window
              </Button>
            </fieldset>
          );
        }
        const differs = differingFields(draftWindow(choice.draft, unit), zoneWindow);
        return (
          <div key={q} className="flex flex-col gap-2" data-source="bench" data-quantity={q}>
            <p className="text-lg" data-differs-from-zone={differs.length > 0}>
              <span className="mr-2 rounded-full bg-accent px-3 py-0.5 font-semibold text-page">Own window</span>
              {differs.length > 0 ? (
                <strong>
                  {label}: differs from the zone in {differsWords(differs)}
                </strong>
              ) : (
                `${label}: same values as the zone`
              )}
            </p>
            <QuantityFieldset
              draft={choice.draft}
              unit={unit}
              errors={errors.fields}
              zoneWindow={zoneWindow}
              onChange={(next) => {
                update((d) => ({ ...d, quantities: d.quantities.map((c) => (c.draft.quantity === q ? { ...c, draft: next } : c)) }));
              }}
            />
            <Button className="self-start" onClick={() => setMode(q, "zone")}>
              <span aria-hidden="true">↺</span> Go back to the zone&apos;s {label.toLowerCase()} window
            </Button>
          </div>
        );
      })}
      <fieldset className="rounded-2xl border-2 border-line bg-surface p-4" data-source={draft.margin.mode}>
        <legend className="px-1 text-xl font-bold">Condensation</legend>
        {draft.margin.mode === "zone" ? (
          <>
            <p className="text-lg">
              <span className="mr-2 rounded-full bg-ok-soft px-3 py-0.5 font-semibold text-ok">Follows the zone</span>
              Dew-point margin {formatMargin(data.zone.dewPointMarginC, unit)}
            </p>
            <Button className="mt-3" onClick={() => update((d) => ({ ...d, margin: { ...d.margin, mode: "bench" } }))}>
              Give this bench its own margin
            </Button>
          </>
        ) : (
          <div className="flex flex-col gap-3">
            <MarginField
              draft={draft.margin.draft}
              unit={unit}
              zoneMarginC={data.zone.dewPointMarginC}
              error={errors.fields.dewPointMarginC}
              onChange={(next) => update((d) => ({ ...d, margin: { ...d.margin, draft: next } }))}
            />
            <Button className="self-start" onClick={() => update((d) => ({ ...d, margin: { ...d.margin, mode: "zone" } }))}>
              <span aria-hidden="true">↺</span> Go back to the zone&apos;s margin
            </Button>
          </div>
        )}
      </fieldset>
      {review ? (
        <ReviewPanel
          warnings={review.warnings}
          savedWarnings={data.warnings}
          isSaving={save.isPending}
          onSaveAnyway={() => void commit(review.input)}
          onBack={() => setReview(null)}
        />
      ) : (
        <div className="flex flex-wrap gap-3">
          <Button type="submit" variant="primary" isBusy={save.isPending}>
            Check and save
          </Button>
          {hasOwn && (
            <Button
              onClick={() =>
                update((d) => ({ quantities: d.quantities.map((c) => ({ ...c, mode: "zone" })), margin: { ...d.margin, mode: "zone" } }))
              }
            >
              Follow the zone for everything
            </Button>
          )}
          <Button disabled={draft === initial.current} onClick={() => update(() => initial.current)}>
            Undo my changes
          </Button>
        </div>
      )}
      {!review && data.warnings.length > 0 && (
        <section aria-labelledby="bench-saved-warnings" className="flex flex-col gap-2">
          <h3 id="bench-saved-warnings" className="text-lg font-bold">
            Where the windows in force leave common guidance
          </h3>
          <WindowWarningList warnings={data.warnings} />
        </section>
      )}
    </form>
  );
}
