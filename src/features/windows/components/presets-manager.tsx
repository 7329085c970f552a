import { useRef, useState, type FormEvent } from "react";
import { windowWarnings } from "../../../../shared/domain/window-guidance.js";
import { WINDOWED_QUANTITIES } from "../../../../shared/schemas/quantities.js";
import { windowPresetInputSchema, type WindowPreset, type WindowPresetInput, type WindowWarning } from "../../../../shared/schemas/windows.js";
import { Button } from "../../../components/ui/button";
import { ConfirmDialog } from "../../../components/ui/dialog";
import { TextField } from "../../../components/ui/form";
import { Notice } from "../../../components/ui/notice";
import { useToast } from "../../../components/ui/toast";
import { ALLOWED, useAuthorization } from "../../../lib/authorization";
import { focusFirstInvalid } from "../../../lib/form";
import { QUANTITY_LABELS } from "../../../lib/quantity-labels";
import { useTemperatureUnit } from "../../../lib/temperature-unit";
import { useCreateWindowPreset } from "../api/create-window-preset";
import { useDeleteWindowPreset } from "../api/delete-window-preset";
import { useWindowPresets } from "../api/get-window-presets";
import { useUpdateWindowPreset } from "../api/update-window-preset";
import { NO_WINDOW_ERRORS, windowErrorsFromApi, type WindowFormErrors } from "../utils/window-errors";
import { draftWindows, marginSi, placeWindowIssues, windowSetDraft, zodIssues, type QuantityDraft, type WindowSetDraft } from "../utils/window-values";
import { ReadOnlyNotice } from "./read-only-notice";
import { ReviewPanel } from "./review-panel";
import { MarginField, QuantityFieldset } from "./window-fields";
import { WindowSetView } from "./window-set-view";

const BASIS_WORDS = { published: "Published source", "common-practice": "Common practice", benchwarden: "How Benchwarden works" } as const;

type Editing = { mode: "create"; from?: WindowPreset } | { mode: "edit"; preset: WindowPreset };

/**
 * The window presets: Benchwarden's built-in ones (read only, each value with its source) and
 * the nursery's own, which managers and admins create, edit and delete.
 */
export function PresetsManager() {
  const { data } = useWindowPresets();
  const { isAllowed } = useAuthorization();
  const canEdit = isAllowed(ALLOWED.manageGrowing);
  const [editing, setEditing] = useState<Editing | null>(null);
  const builtIn = data.presets.filter((p) => p.builtIn);
  const custom = data.presets.filter((p) => !p.builtIn);

  return (
    <div className="flex flex-col gap-8">
      {!canEdit && <ReadOnlyNotice what="the presets" />}
      {canEdit && !editing && (
        <Button variant="primary" className="self-start" onClick={() => setEditing({ mode: "create" })}>
          New preset
        </Button>
      )}
      {editing && <PresetForm key={editing.mode === "edit" ? editing.preset.id : `new-${editing.from?.id ?? ""}`} editing={editing} onDone={() => setEditing(null)} />}
      <section aria-labelledby="own-presets-heading" className="flex flex-col gap-4">
        <h2 id="own-presets-heading" className="text-2xl font-bold">
          The nursery&apos;s own presets
        </h2>
        {custom.length === 0 && <p className="text-lg text-muted">None yet. Start one from scratch or copy a built-in preset.</p>}
        {custom.map((p) => (
          <PresetCard key={p.id} preset={p} canEdit={canEdit} onEdit={() => setEditing({ mode: "edit", preset: p })} onCopy={() => setEditing({ mode: "create", from: p })} />
        ))}
      </section>
      <section aria-labelledby="built-in-presets-heading" className="flex flex-col gap-4">
        <h2 id="built-in-presets-heading" className="text-2xl font-bold">
          Built into Benchwarden
        </h2>
        {builtIn.map((p) => (
          <PresetCard key={p.id} preset={p} canEdit={canEdit} onCopy={() => setEditing({ mode: "create", from: p })} />
        ))}
      </section>
    </div>
  );
}

function PresetCard({ preset, canEdit, onEdit, onCopy }: { preset: WindowPreset; canEdit: boolean; onEdit?: () => void; onCopy: () => void }) {
  const { unit } = useTemperatureUnit();
  const { showToast } = useToast();
  const remove = useDeleteWindowPreset();
  const [isConfirming, setIsConfirming] = useState(false);
  return (
    <article aria-labelledby={`preset-${preset.id}`} data-preset-id={preset.id} className="flex flex-col gap-3 rounded-2xl border-2 border-line bg-surface p-4">
      <div className="flex flex-wrap items-baseline gap-x-3">
        <h3 id={`preset-${preset.id}`} className="text-xl font-bold">
          {preset.name}
        </h3>
        {preset.builtIn && <span className="rounded-full bg-none-soft px-3 text-base font-semibold text-muted">Built in</span>}
      </div>
      {preset.description && <p className="text-lg">{preset.description}</p>}
      <WindowSetView
        caption={`Windows of preset ${preset.name}`}
        rows={WINDOWED_QUANTITIES.map((q) => ({ quantity: q, window: preset.windows.find((w) => w.quantity === q) ?? null }))}
        margin={{ valueC: preset.dewPointMarginC }}
        unit={unit}
      />
      {preset.notes.length > 0 && (
        <details className="text-base">
          <summary className="min-h-touch cursor-pointer py-2 text-lg font-semibold">Where these values come from</summary>
          <ul className="flex flex-col gap-2">
            {preset.notes.map((n) => (
              <li key={`${n.quantity ?? "margin"}`}>
                <strong>{n.quantity ? QUANTITY_LABELS[n.quantity] : "Dew-point margin"}:</strong> {n.note}{" "}
                <span className="text-muted">
                  {BASIS_WORDS[n.source.basis]}: {n.source.citation}
                </span>
              </li>
            ))}
          </ul>
        </details>
      )}
      {canEdit && (
        <div className="flex flex-wrap gap-3">
          {onEdit && <Button onClick={onEdit}>Edit {preset.name}</Button>}
          <Button onClick={onCopy}>Copy to a new preset</Button>
          {!preset.builtIn && (
            <Button variant="danger" onClick={() => setIsConfirming(true)}>
              Delete {preset.name}
            </Button>
          )}
        </div>
      )}
      {isConfirming && (
        <ConfirmDialog
          title={`Delete “${preset.name}”?`}
          confirmLabel="Delete preset"
          confirmVariant="danger"
          isBusy={remove.isPending}
          onCancel={() => setIsConfirming(false)}
          onConfirm={() =>
            remove.mutate(preset.id, {
              onSuccess: () => {
                setIsConfirming(false);
                showToast(`Preset “${preset.name}” deleted`);
              },
              onError: (e) => {
                setIsConfirming(false);
                showToast(`Not deleted: ${e.message}`, "error");
              },
            })
          }
        >
          Zones and benches it was applied to keep their windows; only the preset goes.
        </ConfirmDialog>
      )}
    </article>
  );
}

function PresetForm({ editing, onDone }: { editing: Editing; onDone: () => void }) {
  const { unit } = useTemperatureUnit();
  const { showToast } = useToast();
  const formRef = useRef<HTMLFormElement>(null);
  const source = editing.mode === "edit" ? editing.preset : editing.from;
  const [name, setName] = useState(editing.mode === "edit" ? editing.preset.name : source ? `${source.name} (copy)` : "");
  const [description, setDescription] = useState(source?.description ?? "");
  const [draft, setDraft] = useState<WindowSetDraft>(() => {
    const d = windowSetDraft(source?.windows ?? [], source?.dewPointMarginC ?? 2, unit);
    // A preset from scratch starts with every quantity on, to be filled in.
    return source ? d : { ...d, quantities: d.quantities.map((q) => ({ ...q, isOn: true })) };
  });
  const [errors, setErrors] = useState<WindowFormErrors & { name?: string; description?: string }>(NO_WINDOW_ERRORS);
  const [review, setReview] = useState<{ input: WindowPresetInput; warnings: WindowWarning[] } | null>(null);
  const create = useCreateWindowPreset();
  const update = useUpdateWindowPreset();
  const isBusy = create.isPending || update.isPending;
  // What the stored values already warn about (shared rules), so the review marks which warnings are new.
  const savedWarnings = editing.mode === "edit" ? windowWarnings(editing.preset) : [];

  function send(input: WindowPresetInput, dryRun: boolean) {
    return editing.mode === "edit" ? update.mutateAsync({ id: editing.preset.id, input, dryRun }) : create.mutateAsync({ input, dryRun });
  }

  function showError(error: unknown, input: WindowPresetInput) {
    setReview(null);
    const placed = windowErrorsFromApi(error, input.windows.map((w) => w.quantity));
    const nameError = (error as { fieldErrors?: { path: string; message: string }[] }).fieldErrors?.find((f) => f.path === "name")?.message;
    setErrors({ ...placed, form: nameError ? null : placed.form, name: nameError });
    focusFirstInvalid(formRef.current);
  }

  async function commit(input: WindowPresetInput) {
    try {
      const saved = await send(input, false);
      if (!saved.changed) showToast("Nothing to save: these are the stored values", "info");
      else showToast(editing.mode === "edit" ? `Preset “${input.name}” saved` : `Preset “${input.name}” created`);
      onDone();
    } catch (error) {
      showError(error, input);
    }
  }

  async function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const windows = draftWindows(draft, unit);
    // The values checked are the SI values sent: the same schema the server parses the body with.
    const parsed = windowPresetInputSchema.safeParse({ name, description, windows, dewPointMarginC: marginSi(draft.margin, unit) });
    if (!parsed.success) {
      const issues = zodIssues(parsed.error);
      const placed = placeWindowIssues(issues.filter((i) => i.path !== "name" && i.path !== "description"), windows.map((w) => w.quantity));
      setErrors({ ...placed, name: issues.find((i) => i.path === "name")?.message, description: issues.find((i) => i.path === "description")?.message });
      focusFirstInvalid(formRef.current);
      return;
    }
    setErrors(NO_WINDOW_ERRORS);
    const input = parsed.data;
    // The server's dry run, as for a zone's window: every check of a save (a free name too) and the
    // guidance warnings, shown before anything is stored.
    try {
      const answer = await send(input, true);
      if (!answer.changed) return showToast("Nothing to save: these are the stored values", "info");
      if (answer.warnings.length > 0) return setReview({ input, warnings: answer.warnings });
    } catch (error) {
      return showError(error, input);
    }
    await commit(input);
  }

  const editQuantity = (next: QuantityDraft) => {
    setDraft((d) => ({ ...d, quantities: d.quantities.map((q) => (q.quantity === next.quantity ? next : q)) }));
    setReview(null);
  };

  return (
    <section aria-labelledby="preset-form-heading" className="rounded-2xl border-2 border-accent bg-page p-4">
      <h2 id="preset-form-heading" className="mb-3 text-2xl font-bold">
        {editing.mode === "edit" ? `Edit “${editing.preset.name}”` : source ? `New preset from “${source.name}”` : "New preset"}
      </h2>
      <form ref={formRef} onSubmit={(event) => void onSubmit(event)} noValidate aria-label="Preset" className="flex flex-col gap-4">
        {errors.form && <Notice tone="error">{errors.form}</Notice>}
        <div className="grid gap-4 sm:grid-cols-2">
          <TextField label="Name" value={name} onChange={(e) => setName(e.target.value)} error={errors.name} autoComplete="off" />
          <TextField label="What it is for" value={description} onChange={(e) => setDescription(e.target.value)} error={errors.description} autoComplete="off" />
        </div>
        {draft.quantities.map((q) => (
          <QuantityFieldset key={q.quantity} draft={q} unit={unit} errors={errors.fields} onChange={editQuantity} canSwitchOff />
        ))}
        <fieldset className="rounded-2xl border-2 border-line bg-surface p-4">
          <legend className="px-1 text-xl font-bold">Condensation</legend>
          <MarginField draft={draft.margin} unit={unit} error={errors.fields.dewPointMarginC} onChange={(margin) => setDraft((d) => ({ ...d, margin }))} />
        </fieldset>
        {review ? (
          <ReviewPanel warnings={review.warnings} savedWarnings={savedWarnings} isSaving={isBusy} onSaveAnyway={() => void commit(review.input)} onBack={() => setReview(null)} />
        ) : (
          <div className="flex flex-wrap gap-3">
            <Button type="submit" variant="primary" isBusy={isBusy}>
              {editing.mode === "edit" ? "Check and save" : "Check and create"}
            </Button>
            <Button onClick={onDone}>Cancel</Button>
          </div>
        )}
      </form>
    </section>
  );
}
