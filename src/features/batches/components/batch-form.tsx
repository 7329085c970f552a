import { useRef, useState, type FormEvent } from "react";
import {
  BASE_TREATMENT_LABELS,
  BASE_TREATMENTS,
  createBatchInputSchema,
  HORMONE_CAUTION,
  treatmentIssues,
  updateBatchInputSchema,
  WRAPPING_LABELS,
  WRAPPINGS,
  type BaseTreatment,
  type BatchView,
  type CreateBatchInput,
  type UpdateBatchInput,
  type Wrapping,
} from "../../../../shared/schemas/batches.js";
import { Button } from "../../../components/ui/button";
import { SelectField, TextAreaField, TextField } from "../../../components/ui/form";
import { Notice } from "../../../components/ui/notice";
import { useFormErrors } from "../../../lib/form";
import { BenchOptions, type BenchGroup } from "./bench-options";
import { HandlingCautions } from "./cautions";
import { ToggleButton } from "./toggle-button";

const FIELDS = ["variety", "woodSource", "stuckOn", "countStuck", "benchId", "thicknessMm", "budsAboveMedium", "baseTreatments", "hormoneProduct", "wrapping", "notes"] as const;

type Values = {
  variety: string;
  woodSource: string;
  stuckOn: string;
  countStuck: string;
  benchId: string;
  thicknessMm: string;
  budsAboveMedium: string;
  baseTreatments: BaseTreatment[];
  hormoneProduct: string;
  wrapping: Wrapping | "";
  notes: string;
};

/** "" → null; anything else as a number for the shared schema to judge. */
function optionalNumber(text: string): number | null {
  const t = text.trim().replace(",", ".");
  return t === "" ? null : Number(t);
}

function fromBatch(batch: BatchView | undefined, today: string, benchId: number | undefined): Values {
  return {
    variety: batch?.variety ?? "",
    woodSource: batch?.woodSource ?? "",
    stuckOn: batch?.stuckOn ?? today,
    countStuck: batch ? String(batch.countStuck) : "",
    benchId: batch ? String(batch.bench.benchId) : benchId === undefined ? "" : String(benchId),
    thicknessMm: batch?.thicknessMm === null || batch?.thicknessMm === undefined ? "" : String(batch.thicknessMm),
    budsAboveMedium: batch?.budsAboveMedium === null || batch?.budsAboveMedium === undefined ? "" : String(batch.budsAboveMedium),
    baseTreatments: batch?.baseTreatments ?? [],
    hormoneProduct: batch?.hormoneProduct ?? "",
    wrapping: batch?.wrapping ?? "",
    notes: batch?.notes ?? "",
  };
}

/** The values as the API reads them (strings to numbers, "" to null), before the schema. */
function toBody(v: Values) {
  return {
    variety: v.variety,
    woodSource: v.woodSource,
    stuckOn: v.stuckOn,
    countStuck: v.countStuck.trim() === "" ? Number.NaN : Number(v.countStuck.trim()),
    thicknessMm: optionalNumber(v.thicknessMm),
    budsAboveMedium: optionalNumber(v.budsAboveMedium),
    baseTreatments: v.baseTreatments,
    hormoneProduct: v.hormoneProduct,
    wrapping: v.wrapping === "" ? null : v.wrapping,
    notes: v.notes,
  };
}

type BatchFormProps = {
  /** Absent: a new batch. */
  batch?: BatchView;
  benchGroups: readonly BenchGroup[];
  /** The site's today, "YYYY-MM-DD" (the default date stuck). */
  today: string;
  defaultBenchId?: number;
  isBusy: boolean;
  submitLabel: string;
  onCancel: () => void;
  onCreate?: (input: CreateBatchInput, form: HTMLFormElement | null, showServerError: (error: unknown) => void) => void;
  onUpdate?: (input: UpdateBatchInput, form: HTMLFormElement | null, showServerError: (error: unknown) => void) => void;
};

/**
 * A batch's own fields, checked with the server's schema (and its treatment rule) before
 * anything is sent; the server's field errors land on the same fields. The bench is chosen only
 * for a new batch: later it changes by a move, which keeps the history.
 */
export function BatchForm({ batch, benchGroups, today, defaultBenchId, isBusy, submitLabel, onCancel, onCreate, onUpdate }: BatchFormProps) {
  const formRef = useRef<HTMLFormElement>(null);
  const [values, setValues] = useState<Values>(() => fromBatch(batch, today, defaultBenchId));
  const { errors, validate, showServerError, clearField } = useFormErrors({ fields: FIELDS });
  const isNew = batch === undefined;
  const hasHormone = values.baseTreatments.includes("hormone");

  function set<K extends keyof Values>(key: K, value: Values[K]) {
    setValues((v) => ({ ...v, [key]: value }));
    clearField(key);
  }

  function toggleTreatment(t: BaseTreatment) {
    set("baseTreatments", values.baseTreatments.includes(t) ? values.baseTreatments.filter((x) => x !== t) : BASE_TREATMENTS.filter((x) => x === t || values.baseTreatments.includes(x)));
  }

  function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const body = toBody(values);
    const onServerError = (error: unknown) => showServerError(error, formRef.current);
    if (isNew) {
      const input = validate(createBatchInputSchema, { ...body, benchId: values.benchId === "" ? undefined : Number(values.benchId) }, formRef.current);
      if (input) onCreate?.(input, formRef.current, onServerError);
      return;
    }
    // Only what changed is sent; the treatment rule is checked on the result, as the server does.
    const changed: Record<string, unknown> = {};
    const before = toBody(fromBatch(batch, today, undefined));
    for (const key of Object.keys(body) as (keyof typeof body)[]) {
      if (JSON.stringify(body[key]) !== JSON.stringify(before[key])) changed[key] = body[key];
    }
    const current = batch;
    const editSchema = updateBatchInputSchema.superRefine((v, ctx) => {
      const result = {
        baseTreatments: v.baseTreatments ?? current.baseTreatments,
        hormoneProduct: v.hormoneProduct !== undefined ? v.hormoneProduct : current.hormoneProduct,
      };
      for (const issue of treatmentIssues(result)) ctx.addIssue({ code: "custom", path: [issue.path], message: issue.message });
    });
    const input = validate(editSchema, changed, formRef.current);
    if (!input) return;
    onUpdate?.(input, formRef.current, onServerError);
  }

  return (
    <form ref={formRef} onSubmit={onSubmit} noValidate aria-label={isNew ? "New batch" : `Edit ${batch.variety}`} className="flex flex-col gap-5">
      {errors.form && <Notice tone="error">{errors.form}</Notice>}
      <div className="grid gap-4 sm:grid-cols-2">
        <TextField label="Variety" value={values.variety} onChange={(e) => set("variety", e.target.value)} error={errors.fields.variety} autoComplete="off" />
        <TextField
          label="Source of the wood"
          hint="Mother tree, row, supplier's lot…"
          value={values.woodSource}
          onChange={(e) => set("woodSource", e.target.value)}
          error={errors.fields.woodSource}
          autoComplete="off"
        />
        <TextField label="Date stuck" type="date" value={values.stuckOn} max={today} onChange={(e) => set("stuckOn", e.target.value)} error={errors.fields.stuckOn} />
        <TextField label="Cuttings stuck" inputMode="numeric" value={values.countStuck} onChange={(e) => set("countStuck", e.target.value)} error={errors.fields.countStuck} />
        {isNew ? (
          <SelectField label="Bench" value={values.benchId} onChange={(e) => set("benchId", e.target.value)} error={errors.fields.benchId}>
            <option value="">Choose a bench</option>
            <BenchOptions groups={benchGroups} />
          </SelectField>
        ) : (
          <div className="flex flex-col gap-1">
            <span className="text-lg font-semibold">Bench</span>
            <p className="min-h-touch py-2 text-lg">
              {batch.bench.benchName} · {batch.bench.zoneName} <span className="text-base text-muted">(use Move to change it)</span>
            </p>
          </div>
        )}
        <TextField label="Cutting thickness (mm)" inputMode="decimal" value={values.thicknessMm} onChange={(e) => set("thicknessMm", e.target.value)} error={errors.fields.thicknessMm} />
        <TextField
          label="Buds above the medium"
          inputMode="numeric"
          value={values.budsAboveMedium}
          onChange={(e) => set("budsAboveMedium", e.target.value)}
          error={errors.fields.budsAboveMedium}
        />
        <SelectField label="Wrapping of the exposed part" value={values.wrapping} onChange={(e) => set("wrapping", e.target.value as Wrapping | "")} error={errors.fields.wrapping}>
          <option value="">Not recorded</option>
          {WRAPPINGS.map((w) => (
            <option key={w} value={w}>
              {WRAPPING_LABELS[w]}
            </option>
          ))}
        </SelectField>
      </div>

      <fieldset className="flex flex-col gap-2">
        <legend className="mb-1 text-lg font-semibold">Base treatment</legend>
        <div className="grid gap-2 sm:grid-cols-3">
          {BASE_TREATMENTS.map((t) => (
            <ToggleButton key={t} isOn={values.baseTreatments.includes(t)} onToggle={() => toggleTreatment(t)}>
              {BASE_TREATMENT_LABELS[t]}
            </ToggleButton>
          ))}
        </div>
        {errors.fields.baseTreatments && <p className="text-base font-semibold text-high">{errors.fields.baseTreatments}</p>}
      </fieldset>
      {(hasHormone || values.hormoneProduct !== "") && (
        <TextField
          label="Hormone product and strength"
          hint={HORMONE_CAUTION}
          placeholder="e.g. IBA 3000 ppm talc"
          value={values.hormoneProduct}
          onChange={(e) => set("hormoneProduct", e.target.value)}
          error={errors.fields.hormoneProduct}
        />
      )}
      <TextAreaField label="Notes" value={values.notes} onChange={(e) => set("notes", e.target.value)} error={errors.fields.notes} />
      <HandlingCautions showHormone={!hasHormone} />
      <div className="flex flex-wrap gap-3">
        <Button type="submit" variant="primary" isBusy={isBusy} className="min-h-14">
          {submitLabel}
        </Button>
        <Button onClick={onCancel} className="min-h-14">
          Cancel
        </Button>
      </div>
    </form>
  );
}
