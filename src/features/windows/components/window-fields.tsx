import { useId } from "react";
import type { TemperatureUnit } from "../../../../shared/domain/units.js";
import type { QuantityWindow } from "../../../../shared/schemas/windows.js";
import { TextField } from "../../../components/ui/form";
import { QUANTITY_LABELS } from "../../../lib/quantity-labels";
import {
  FIELD_LABELS,
  LIMIT_FIELDS,
  differingFields,
  draftWindow,
  fieldKey,
  fieldUnit,
  formatFieldValue,
  formatMargin,
  marginSi,
  withFieldText,
  type FieldDraft,
  type QuantityDraft,
} from "../utils/window-values";

const FIELD_HINTS = {
  min: null,
  max: null,
  delayS: "How long out of window before an alert",
  hysteresis: "How far back inside before it clears",
} as const;

type QuantityFieldsetProps = {
  draft: QuantityDraft;
  unit: TemperatureUnit;
  errors: Readonly<Record<string, string>>;
  onChange: (next: QuantityDraft) => void;
  /** Zone and preset windows: a quantity can be left unwatched. */
  canSwitchOff?: boolean;
  /** Bench overrides: the zone's window, shown beside each field, with the fields that differ marked. */
  zoneWindow?: QuantityWindow | null;
};

/** One quantity's window: minimum, maximum, hold-off delay (minutes) and clearing band, in the user's unit. */
export function QuantityFieldset({ draft, unit, errors, onChange, canSwitchOff = false, zoneWindow }: QuantityFieldsetProps) {
  const q = draft.quantity;
  const label = QUANTITY_LABELS[q];
  const checkboxId = useId();
  const differs = zoneWindow !== undefined ? new Set(differingFields(draftWindow(draft, unit), zoneWindow)) : new Set<string>();

  return (
    <fieldset data-quantity={q} className="rounded-2xl border-2 border-line bg-surface p-4">
      <legend className="px-1 text-xl font-bold">{label}</legend>
      {canSwitchOff && (
        <label htmlFor={checkboxId} className="mb-3 flex min-h-touch cursor-pointer items-center gap-3 text-lg">
          <input
            id={checkboxId}
            type="checkbox"
            checked={draft.isOn}
            onChange={(e) => onChange({ ...draft, isOn: e.target.checked })}
            className="size-6 accent-[var(--bw-accent)]"
          />
          Watch {label.toLowerCase()}
        </label>
      )}
      {!draft.isOn ? (
        <p className="text-lg text-muted">Not watched: no alerts for {label.toLowerCase()}.</p>
      ) : (
        <div className="grid gap-4 sm:grid-cols-2 xl:grid-cols-4">
          {LIMIT_FIELDS.map((field) => {
            const isDifferent = differs.has(field);
            const zoneText = zoneWindow ? formatFieldValue(q, field, zoneWindow[field], unit) : null;
            return (
              <TextField
                key={field}
                label={`${FIELD_LABELS[field]} (${fieldUnit(q, field, unit)})`}
                name={fieldKey(q, field)}
                inputMode="decimal"
                autoComplete="off"
                value={draft.fields[field].text}
                onChange={(e) => onChange({ ...draft, fields: { ...draft.fields, [field]: withFieldText(draft.fields[field], e.target.value) } })}
                error={errors[fieldKey(q, field)]}
                data-differs={zoneWindow !== undefined ? isDifferent : undefined}
                hint={
                  zoneWindow !== undefined ? (
                    <span className={isDifferent ? "font-semibold text-ink" : undefined}>
                      {isDifferent ? (
                        <>
                          <span className="mr-1 rounded bg-accent px-1.5 text-page">Differs</span>
                          zone: {zoneText ?? "not watched"}
                        </>
                      ) : (
                        <>Same as zone</>
                      )}
                    </span>
                  ) : (
                    (FIELD_HINTS[field] ?? undefined)
                  )
                }
              />
            );
          })}
        </div>
      )}
    </fieldset>
  );
}

type MarginFieldProps = {
  draft: FieldDraft;
  unit: TemperatureUnit;
  error?: string;
  onChange: (next: FieldDraft) => void;
  /** Bench overrides: the zone's margin to compare against. */
  zoneMarginC?: number;
};

/** The dew-point margin: a temperature difference, so 2 °C is 3.6 °F (no 32° offset). */
export function MarginField({ draft, unit, error, onChange, zoneMarginC }: MarginFieldProps) {
  const valueC = marginSi(draft, unit);
  const isDifferent = zoneMarginC !== undefined && !(Number.isFinite(valueC) && Math.abs(valueC - zoneMarginC) < 1e-9);
  return (
    <TextField
      label={`${FIELD_LABELS.dewPointMarginC} (${unit === "F" ? "°F" : "°C"})`}
      name="dewPointMarginC"
      inputMode="decimal"
      autoComplete="off"
      value={draft.text}
      onChange={(e) => onChange(withFieldText(draft, e.target.value))}
      error={error}
      data-differs={zoneMarginC !== undefined ? isDifferent : undefined}
      hint={
        zoneMarginC !== undefined ? (
          isDifferent ? (
            <span className="font-semibold text-ink">
              <span className="mr-1 rounded bg-accent px-1.5 text-page">Differs</span>zone: {formatMargin(zoneMarginC, unit)}
            </span>
          ) : (
            "Same as zone"
          )
        ) : (
          "Warn of condensation when the air comes this close to its dew point"
        )
      }
      className="max-w-sm"
    />
  );
}
