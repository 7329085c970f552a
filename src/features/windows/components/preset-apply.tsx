import { useId, useState, type FormEvent } from "react";
import { WINDOWED_QUANTITIES } from "../../../../shared/schemas/quantities.js";
import type { QuantityWindow, WindowWarning } from "../../../../shared/schemas/windows.js";
import { Button } from "../../../components/ui/button";
import { SelectField } from "../../../components/ui/form";
import { Notice } from "../../../components/ui/notice";
import { useToast } from "../../../components/ui/toast";
import { errorsFromApi } from "../../../lib/form";
import { useTemperatureUnit } from "../../../lib/temperature-unit";
import { useApplyBenchPreset } from "../api/apply-bench-preset";
import { useApplyZonePreset } from "../api/apply-zone-preset";
import { useWindowPresets } from "../api/get-window-presets";
import { WindowSetView } from "./window-set-view";
import { WindowWarningList } from "./window-warnings";

type Target = { kind: "zone"; zoneId: number; name: string; benchOverrideCount: number } | { kind: "bench"; benchId: number; name: string };

type Preview = { presetId: string; presetName: string; changed: boolean; windows: QuantityWindow[]; marginC: number; warnings: WindowWarning[] };

/**
 * Apply a preset to a zone (its windows and margin are replaced) or a bench (they become its
 * overrides): choose, preview with a dry run (the values and their warnings), then apply.
 */
export function PresetApply({ target }: { target: Target }) {
  const { data } = useWindowPresets();
  const { unit } = useTemperatureUnit();
  const { showToast } = useToast();
  const zoneApply = useApplyZonePreset();
  const benchApply = useApplyBenchPreset();
  const [presetId, setPresetId] = useState(data.presets[0]?.id ?? "");
  const [preview, setPreview] = useState<Preview | null>(null);
  const [clearOverrides, setClearOverrides] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const checkboxId = useId();
  const isBusy = zoneApply.isPending || benchApply.isPending;

  function run(dryRun: boolean) {
    const preset = data.presets.find((p) => p.id === presetId);
    if (!preset) return setError("Choose a preset");
    setError(null);
    const onError = (e: unknown) => setError(errorsFromApi(e, { fields: [] }).form);
    const onDone = (answer: { changed: boolean; warnings: WindowWarning[] }, windows: QuantityWindow[], marginC: number) => {
      if (dryRun) {
        setPreview({ presetId, presetName: preset.name, changed: answer.changed, windows, marginC, warnings: answer.warnings });
        return;
      }
      setPreview(null);
      showToast(answer.changed ? `Preset “${preset.name}” applied to ${target.name}` : `${target.name} already has these values`, answer.changed ? "success" : "info");
    };
    if (target.kind === "zone") {
      zoneApply.mutate(
        { zoneId: target.zoneId, input: { presetId, clearBenchOverrides: clearOverrides }, dryRun },
        { onSuccess: (a) => onDone(a, a.windows, a.dewPointMarginC), onError },
      );
    } else {
      benchApply.mutate(
        { benchId: target.benchId, input: { presetId }, dryRun },
        { onSuccess: (a) => onDone(a, a.overrides.windows, a.overrides.dewPointMarginC ?? a.dewPointMargin.valueC), onError },
      );
    }
  }

  function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    run(true);
  }

  return (
    <div className="flex flex-col gap-4">
      <form onSubmit={onSubmit} noValidate aria-label="Choose a preset" className="flex flex-wrap items-end gap-3">
        <SelectField
          label="Preset"
          value={presetId}
          onChange={(e) => {
            setPresetId(e.target.value);
            setPreview(null);
          }}
          className="min-w-64"
        >
          {data.presets.map((p) => (
            <option key={p.id} value={p.id}>
              {p.name}
              {p.builtIn ? " (built in)" : ""}
            </option>
          ))}
        </SelectField>
        <Button type="submit" isBusy={isBusy && !preview}>
          Preview
        </Button>
      </form>
      {error && <Notice tone="error">{error}</Notice>}
      {preview && preview.presetId === presetId && (
        <section aria-labelledby="preset-preview-heading" className="flex flex-col gap-3 rounded-2xl border-2 border-accent bg-surface p-4">
          <h3 id="preset-preview-heading" className="text-xl font-bold">
            {target.kind === "zone" ? `${target.name} with “${preview.presetName}”` : `“${preview.presetName}” as ${target.name}'s own windows`}
          </h3>
          {!preview.changed && <p className="text-lg">{target.name} already has these values; applying changes nothing.</p>}
          <WindowSetView
            caption={`Windows of preset ${preview.presetName}`}
            rows={WINDOWED_QUANTITIES.map((q) => ({ quantity: q, window: preview.windows.find((w) => w.quantity === q) ?? null }))}
            margin={{ valueC: preview.marginC }}
            unit={unit}
          />
          {preview.warnings.length > 0 && (
            <>
              <p className="text-lg font-semibold">Before applying: these values leave common guidance.</p>
              <WindowWarningList warnings={preview.warnings} />
            </>
          )}
          {target.kind === "zone" && target.benchOverrideCount > 0 && (
            <label htmlFor={checkboxId} className="flex min-h-touch cursor-pointer items-center gap-3 text-lg">
              <input id={checkboxId} type="checkbox" checked={clearOverrides} onChange={(e) => setClearOverrides(e.target.checked)} className="size-6 accent-[var(--bw-accent)]" />
              Also remove the own windows of {target.benchOverrideCount === 1 ? "1 bench" : `${target.benchOverrideCount} benches`}
            </label>
          )}
          <div className="flex flex-wrap gap-3">
            <Button variant="primary" isBusy={isBusy} disabled={!preview.changed && !clearOverrides} onClick={() => run(false)}>
              {preview.warnings.length > 0 ? "Apply anyway" : "Apply preset"}
            </Button>
            <Button onClick={() => setPreview(null)}>Cancel</Button>
          </div>
        </section>
      )}
    </div>
  );
}
