import { useRef, useState, type FormEvent } from "react";
import { KIND_WINDOWED_QUANTITIES } from "../../../../shared/domain/calibration.js";
import { celsiusDeltaToFahrenheit, fahrenheitDeltaToCelsius, type TemperatureUnit } from "../../../../shared/domain/units.js";
import type { WindowedQuantity } from "../../../../shared/schemas/quantities.js";
import { updateSensorInputSchema, type SensorView } from "../../../../shared/schemas/sensors.js";
import { Button } from "../../../components/ui/button";
import { Dialog } from "../../../components/ui/dialog";
import { TextField } from "../../../components/ui/form";
import { Notice } from "../../../components/ui/notice";
import { useToast } from "../../../components/ui/toast";
import { useFormErrors } from "../../../lib/form";
import { QUANTITY_LABELS } from "../../../lib/quantity-labels";
import { useTemperatureUnit } from "../../../lib/temperature-unit";
import { useUpdateSensor } from "../api/update-sensor";

type Entry = { offset: string; gain: string };

/** Offsets are typed in the reader's units (°F or °C difference, % RH, % VWC) and stored in SI. */
function offsetUnit(quantity: WindowedQuantity, unit: TemperatureUnit): string {
  if (quantity === "air.humidity") return "% RH";
  if (quantity === "medium.moisture") return "% VWC";
  return unit === "F" ? "°F" : "°C";
}

function toShown(quantity: WindowedQuantity, offset: number, unit: TemperatureUnit): number {
  if (quantity === "medium.moisture") return offset * 100;
  if (quantity === "air.humidity") return offset;
  return unit === "F" ? celsiusDeltaToFahrenheit(offset) : offset;
}

function toStored(quantity: WindowedQuantity, shown: number, unit: TemperatureUnit): number {
  if (quantity === "medium.moisture") return shown / 100;
  if (quantity === "air.humidity") return shown;
  return unit === "F" ? fahrenheitDeltaToCelsius(shown) : shown;
}

/** "" and "1.5" become numbers; anything else stays text so the shared schema says what is wrong. */
function parseNumber(text: string, empty: number): number | string {
  const trimmed = text.trim().replace(",", ".");
  if (trimmed === "") return empty;
  const value = Number(trimmed);
  return Number.isFinite(value) ? value : text;
}

const round = (value: number) => String(Number(value.toFixed(3)));

type CalibrateSensorDialogProps = { sensor: SensorView; onClose: () => void };

/**
 * A probe's correction per quantity, found by checking it against a reference instrument:
 * stored = gain × measured + offset. Applies to readings received after saving.
 */
export function CalibrateSensorDialog({ sensor, onClose }: CalibrateSensorDialogProps) {
  const { unit } = useTemperatureUnit();
  const quantities = KIND_WINDOWED_QUANTITIES[sensor.kind];
  const formRef = useRef<HTMLFormElement>(null);
  const [entries, setEntries] = useState<Record<string, Entry>>(() =>
    Object.fromEntries(
      quantities.map((q) => {
        const c = sensor.calibration[q] ?? { offset: 0, gain: 1 };
        return [q, { offset: round(toShown(q, c.offset, unit)), gain: round(c.gain) }];
      }),
    ),
  );
  const fields = quantities.flatMap((q) => [`calibration.${q}.offset`, `calibration.${q}.gain`]);
  const { errors, validate, showServerError, clearField } = useFormErrors({ fields });
  const update = useUpdateSensor();
  const { showToast } = useToast();

  function setEntry(quantity: WindowedQuantity, part: keyof Entry, value: string) {
    setEntries((current) => ({ ...current, [quantity]: { ...current[quantity]!, [part]: value } }));
    clearField(`calibration.${quantity}.${part}`);
  }

  function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const calibration = Object.fromEntries(
      quantities.map((q) => {
        const offset = parseNumber(entries[q]!.offset, 0);
        return [q, { offset: typeof offset === "number" ? toStored(q, offset, unit) : offset, gain: parseNumber(entries[q]!.gain, 1) }];
      }),
    );
    const input = validate(updateSensorInputSchema, { calibration }, formRef.current);
    if (!input) return;
    update.mutate(
      { sensorId: sensor.id, input },
      {
        onSuccess: () => {
          showToast(`Calibration of ${sensor.id} saved: it applies to readings from now on`);
          onClose();
        },
        onError: (error) => showServerError(error, formRef.current),
      },
    );
  }

  return (
    <Dialog title={`Calibrate ${sensor.id}`} onClose={onClose}>
      <form ref={formRef} onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
        <p>
          Check the probe beside a reference instrument you trust, then enter the correction. Benchwarden stores{" "}
          <strong>gain × measured + offset</strong>. It applies to readings received after saving; readings already stored are not changed.
        </p>
        {errors.form && <Notice tone="error">{errors.form}</Notice>}
        {quantities.map((q) => (
          <fieldset key={q} className="grid grid-cols-1 gap-3 rounded-lg border border-line p-3 sm:grid-cols-2">
            <legend className="px-1 text-lg font-semibold">{QUANTITY_LABELS[q]}</legend>
            <TextField
              label={`Offset (${offsetUnit(q, unit)})`}
              hint="Added to what the probe reads; 0 for none"
              inputMode="decimal"
              value={entries[q]!.offset}
              onChange={(e) => setEntry(q, "offset", e.target.value)}
              error={errors.fields[`calibration.${q}.offset`]}
            />
            <TextField
              label="Gain"
              hint="Multiplies what the probe reads; 1 for none"
              inputMode="decimal"
              value={entries[q]!.gain}
              onChange={(e) => setEntry(q, "gain", e.target.value)}
              error={errors.fields[`calibration.${q}.gain`]}
            />
          </fieldset>
        ))}
        <div className="flex flex-wrap justify-end gap-3">
          <Button onClick={onClose}>Cancel</Button>
          <Button type="submit" variant="primary" isBusy={update.isPending}>
            Save calibration
          </Button>
        </div>
      </form>
    </Dialog>
  );
}
