import { useMutation } from "@tanstack/react-query";
import { useRef, useState, type FormEvent } from "react";
import {
  EXPORT_INTERVALS,
  MAX_RAW_EXPORT_MS,
  MAX_ROLLUP_EXPORT_MS,
  readingsExportQuerySchema,
  type ExportInterval,
} from "../../../../shared/schemas/exports.js";
import { Button } from "../../../components/ui/button";
import { Dialog } from "../../../components/ui/dialog";
import { SelectField, TextField } from "../../../components/ui/form";
import { Notice } from "../../../components/ui/notice";
import { useToast } from "../../../components/ui/toast";
import { errorsFromApi, errorsFromZod, type FormErrors } from "../../../lib/form";
import { useTemperatureUnit } from "../../../lib/temperature-unit";
import { getReadingsExport, saveFile, type ReadingsExportParams } from "../api/get-readings-export";

const INTERVAL_LABELS: Record<ExportInterval, string> = {
  raw: "Every reading (raw)",
  "1m": "1-minute mean, low and high",
  "5m": "5-minute mean, low and high",
  "15m": "15-minute mean, low and high",
  "30m": "30-minute mean, low and high",
  "1h": "Hourly mean, low and high",
};

const FIELDS = ["from", "to", "interval", "benchId"] as const;

/** `<input type="datetime-local">` value in local time: "2025-01-15T06:00". */
function toLocalInput(timeMs: number): string {
  const d = new Date(timeMs);
  const pad = (n: number) => String(n).padStart(2, "0");
  return `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}T${pad(d.getHours())}:${pad(d.getMinutes())}`;
}

function fromLocalInput(value: string): number {
  return /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}/.test(value) ? new Date(value).getTime() : Number.NaN;
}

type ExportCsvButtonProps = {
  /** What is exported: one bench or a whole zone. */
  target: { benchId: number; zoneId?: undefined } | { zoneId: number; benchId?: undefined };
  /** e.g. "House 1 › Bench 2", for the dialog's title. */
  label: string;
  /** The chart's range, asked for when the dialog opens (so "the last 7 days" ends now). */
  defaultRange: () => { fromMs: number; toMs: number };
};

/** "Export CSV": a bench's or a zone's readings over a range, raw or rolled up, temperatures in the user's unit. */
export function ExportCsvButton({ target, label, defaultRange }: ExportCsvButtonProps) {
  const [bounds, setBounds] = useState<{ fromMs: number; toMs: number } | null>(null);
  return (
    <>
      <Button onClick={() => setBounds(defaultRange())}>
        <span aria-hidden="true">⤓</span> Export CSV
      </Button>
      {bounds && <ExportDialog target={target} label={label} bounds={bounds} onClose={() => setBounds(null)} />}
    </>
  );
}

function ExportDialog({ target, label, bounds, onClose }: Omit<ExportCsvButtonProps, "defaultRange"> & { bounds: { fromMs: number; toMs: number }; onClose: () => void }) {
  const formRef = useRef<HTMLFormElement>(null);
  const { unit } = useTemperatureUnit();
  const { showToast } = useToast();
  const [from, setFrom] = useState(toLocalInput(bounds.fromMs));
  const [to, setTo] = useState(toLocalInput(bounds.toMs));
  const spanMs = bounds.toMs - bounds.fromMs;
  const [interval, setExportInterval] = useState<ExportInterval>(spanMs > 2 * 24 * 3_600_000 ? "15m" : "raw");
  const [moistureUnit, setMoistureUnit] = useState<"percent" | "ratio">("percent");
  const [errors, setErrors] = useState<FormErrors>({ fields: {}, form: null });
  const download = useMutation({ mutationFn: (params: ReadingsExportParams) => getReadingsExport(params) });

  function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const fromMs = fromLocalInput(from);
    const toMs = fromLocalInput(to);
    const params: ReadingsExportParams = { ...target, fromMs, toMs, interval, temperatureUnit: unit, moistureUnit };
    if (Number.isNaN(fromMs) || Number.isNaN(toMs)) {
      setErrors({ fields: Number.isNaN(fromMs) ? { from: "Enter a date and time" } : { to: "Enter a date and time" }, form: null });
      return;
    }
    // The shared schema the server parses the query with; the lengths are the server's limits.
    const parsed = readingsExportQuerySchema.safeParse({ ...target, from: fromMs, to: toMs, interval, temperatureUnit: unit, moistureUnit });
    if (!parsed.success) {
      setErrors(errorsFromZod(parsed.error, FIELDS));
      return;
    }
    if (interval === "raw" && toMs - fromMs > MAX_RAW_EXPORT_MS) {
      setErrors({ fields: { interval: "Every reading is available for at most 31 days at a time; choose a rolled-up interval or fewer days" }, form: null });
      return;
    }
    if (toMs - fromMs > MAX_ROLLUP_EXPORT_MS) {
      setErrors({ fields: { from: "Export at most 400 days at a time" }, form: null });
      return;
    }
    setErrors({ fields: {}, form: null });
    download.mutate(params, {
      onSuccess: (file) => {
        saveFile(file);
        showToast(`Saved ${file.filename}`);
        onClose();
      },
      onError: (error) => setErrors(errorsFromApi(error, { fields: FIELDS })),
    });
  }

  return (
    <Dialog title={`Export CSV · ${label}`} onClose={onClose}>
      <form ref={formRef} onSubmit={onSubmit} noValidate aria-label="Export readings as CSV" className="flex flex-col gap-4">
        <p className="text-base text-muted">
          One row per reading (raw) or per bench and interval, with the units in the header. Temperatures in {unit === "F" ? "°F" : "°C"} (your setting), humidity in % RH.
        </p>
        {errors.form && <Notice tone="error">{errors.form}</Notice>}
        {errors.fields.benchId && <Notice tone="error">{errors.fields.benchId}</Notice>}
        <div className="grid gap-4 sm:grid-cols-2">
          <TextField label="From" type="datetime-local" value={from} onChange={(e) => setFrom(e.target.value)} error={errors.fields.from} />
          <TextField label="To" type="datetime-local" value={to} onChange={(e) => setTo(e.target.value)} error={errors.fields.to} />
        </div>
        <SelectField label="Interval" value={interval} onChange={(e) => setExportInterval(e.target.value as ExportInterval)} error={errors.fields.interval}>
          {EXPORT_INTERVALS.map((i) => (
            <option key={i} value={i}>
              {INTERVAL_LABELS[i]}
            </option>
          ))}
        </SelectField>
        <SelectField label="Medium moisture as" value={moistureUnit} onChange={(e) => setMoistureUnit(e.target.value as "percent" | "ratio")}>
          <option value="percent">Percent (% VWC)</option>
          <option value="ratio">Ratio 0–1 (m³/m³)</option>
        </SelectField>
        <div className="flex flex-wrap justify-end gap-3">
          <Button onClick={onClose}>Cancel</Button>
          <Button type="submit" variant="primary" isBusy={download.isPending}>
            Download CSV
          </Button>
        </div>
      </form>
    </Dialog>
  );
}
