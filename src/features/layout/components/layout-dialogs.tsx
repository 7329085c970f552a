import { useRef, useState, type FormEvent } from "react";
import {
  createBenchInputSchema,
  createSiteInputSchema,
  createZoneInputSchema,
  updateBenchInputSchema,
  updateSiteInputSchema,
  updateZoneInputSchema,
  type BenchView,
  type SiteView,
  type ZoneView,
} from "../../../../shared/schemas/layout.js";
import { Button } from "../../../components/ui/button";
import { Dialog } from "../../../components/ui/dialog";
import { SelectField, TextField } from "../../../components/ui/form";
import { Notice } from "../../../components/ui/notice";
import { useToast } from "../../../components/ui/toast";
import { useFormErrors } from "../../../lib/form";
import { useCreateBench } from "../api/create-bench";
import { useCreateSite } from "../api/create-site";
import { useCreateZone } from "../api/create-zone";
import { useUpdateBench } from "../api/update-bench";
import { useUpdateSite } from "../api/update-site";
import { useUpdateZone } from "../api/update-zone";

const NAME_TAKEN = { "site-name-taken": "name", "zone-name-taken": "name", "bench-name-taken": "name" };

/** The platform's IANA time zones, for suggestions (older browsers: none, the field still takes any). */
function timeZoneSuggestions(): string[] {
  const intl = Intl as unknown as { supportedValuesOf?: (key: string) => string[] };
  try {
    return intl.supportedValuesOf?.("timeZone") ?? [];
  } catch {
    return [];
  }
}

function Actions({ onClose, isBusy, label }: { onClose: () => void; isBusy: boolean; label: string }) {
  return (
    <div className="flex flex-wrap justify-end gap-3">
      <Button onClick={onClose}>Cancel</Button>
      <Button type="submit" variant="primary" isBusy={isBusy}>
        {label}
      </Button>
    </div>
  );
}

const SITE_FIELDS = ["name", "timeZone"] as const;

/** Add a site, or rename one / change its time zone (admin). */
export function SiteDialog({ site, onClose }: { site?: SiteView; onClose: () => void }) {
  const formRef = useRef<HTMLFormElement>(null);
  const [name, setName] = useState(site?.name ?? "");
  const [timeZone, setTimeZone] = useState(site?.timeZone ?? Intl.DateTimeFormat().resolvedOptions().timeZone);
  const { errors, validate, showServerError, clearField } = useFormErrors({ fields: SITE_FIELDS, codeToField: NAME_TAKEN });
  const create = useCreateSite();
  const update = useUpdateSite();
  const { showToast } = useToast();
  const suggestions = timeZoneSuggestions();

  function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const onError = (e: unknown) => showServerError(e, formRef.current);
    if (site) {
      const input = validate(updateSiteInputSchema, { name, timeZone }, formRef.current);
      if (!input) return;
      update.mutate({ id: site.id, input }, { onSuccess: ({ site: s }) => {
            showToast(`${s.name} saved`);
            onClose();
          }, onError });
    } else {
      const input = validate(createSiteInputSchema, { name, timeZone }, formRef.current);
      if (!input) return;
      create.mutate(input, { onSuccess: ({ site: s }) => {
            showToast(`${s.name} added`);
            onClose();
          }, onError });
    }
  }

  return (
    <Dialog title={site ? `Edit ${site.name}` : "Add a site"} onClose={onClose}>
      <form ref={formRef} onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
        {errors.form && <Notice tone="error">{errors.form}</Notice>}
        <TextField label="Name" value={name} onChange={(e) => {
            setName(e.target.value);
            clearField("name");
          }} error={errors.fields.name} autoComplete="off" />
        <TextField
          label="Time zone"
          hint="Where the site is, e.g. America/Chicago: exports and the duty rota use it."
          value={timeZone}
          list="bw-time-zones"
          onChange={(e) => {
            setTimeZone(e.target.value);
            clearField("timeZone");
          }}
          error={errors.fields.timeZone}
          autoComplete="off"
        />
        <datalist id="bw-time-zones">
          {suggestions.map((tz) => (
            <option key={tz} value={tz} />
          ))}
        </datalist>
        <Actions onClose={onClose} isBusy={create.isPending || update.isPending} label={site ? "Save" : "Add site"} />
      </form>
    </Dialog>
  );
}

const ZONE_FIELDS = ["name", "siteId", "presetId"] as const;

type ZoneDialogProps = {
  onClose: () => void;
  /** Editing: the zone. Adding: the site it goes on. */
  zone?: ZoneView;
  siteId?: number;
  /** The presets a new zone can start from (the route has them). */
  presetChoices?: readonly { id: string; name: string }[];
};

/** Add a zone to a site (its windows from a preset, or none), or rename one (admin). */
export function ZoneDialog({ zone, siteId, presetChoices = [], onClose }: ZoneDialogProps) {
  const formRef = useRef<HTMLFormElement>(null);
  const [name, setName] = useState(zone?.name ?? "");
  const [presetId, setPresetId] = useState<string>(presetChoices[0]?.id ?? "");
  const { errors, validate, showServerError, clearField } = useFormErrors({ fields: ZONE_FIELDS, codeToField: NAME_TAKEN });
  const create = useCreateZone();
  const update = useUpdateZone();
  const { showToast } = useToast();

  function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const onError = (e: unknown) => showServerError(e, formRef.current);
    if (zone) {
      const input = validate(updateZoneInputSchema, { name }, formRef.current);
      if (!input) return;
      update.mutate({ id: zone.id, input }, { onSuccess: ({ zone: z }) => {
            showToast(`${z.name} saved`);
            onClose();
          }, onError });
    } else {
      const input = validate(createZoneInputSchema, { siteId, name, presetId: presetId === "" ? null : presetId }, formRef.current);
      if (!input) return;
      create.mutate(input, { onSuccess: ({ zone: z }) => {
            showToast(`${z.name} added`);
            onClose();
          }, onError });
    }
  }

  return (
    <Dialog title={zone ? `Rename ${zone.name}` : "Add a zone"} onClose={onClose}>
      <form ref={formRef} onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
        {errors.form && <Notice tone="error">{errors.form}</Notice>}
        {errors.fields.siteId && <Notice tone="error">{errors.fields.siteId}</Notice>}
        <TextField label="Name" value={name} onChange={(e) => {
            setName(e.target.value);
            clearField("name");
          }} error={errors.fields.name} autoComplete="off" />
        {!zone && (
          <SelectField label="Start its windows from" value={presetId} onChange={(e) => setPresetId(e.target.value)} error={errors.fields.presetId}>
            {presetChoices.map((p) => (
              <option key={p.id} value={p.id}>
                Preset: {p.name}
              </option>
            ))}
            <option value="">No windows yet (nothing watched)</option>
          </SelectField>
        )}
        <Actions onClose={onClose} isBusy={create.isPending || update.isPending} label={zone ? "Save" : "Add zone"} />
      </form>
    </Dialog>
  );
}

const BENCH_FIELDS = ["name", "zoneId"] as const;

type BenchDialogProps = {
  onClose: () => void;
  /** Editing: the bench. Adding: the zone it goes in. */
  bench?: BenchView;
  zoneId?: number;
  /** Zones in use a bench can move to. */
  zoneChoices?: readonly { id: number; name: string }[];
};

/** Add a bench at the end of a zone's walking order, or rename one and move it to another zone (admin, manager). */
export function BenchDialog({ bench, zoneId, zoneChoices = [], onClose }: BenchDialogProps) {
  const formRef = useRef<HTMLFormElement>(null);
  const [name, setName] = useState(bench?.name ?? "");
  const [toZoneId, setToZoneId] = useState(bench?.zoneId ?? zoneId ?? 0);
  const { errors, validate, showServerError, clearField } = useFormErrors({ fields: BENCH_FIELDS, codeToField: NAME_TAKEN });
  const create = useCreateBench();
  const update = useUpdateBench();
  const { showToast } = useToast();

  function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const onError = (e: unknown) => showServerError(e, formRef.current);
    if (bench) {
      const values = { ...(name !== bench.name && { name }), ...(toZoneId !== bench.zoneId && { zoneId: toZoneId }) };
      if (Object.keys(values).length === 0) return onClose();
      const input = validate(updateBenchInputSchema, values, formRef.current);
      if (!input) return;
      update.mutate(
        { id: bench.id, input },
        {
          onSuccess: ({ bench: b }) => {
            const zoneName = zoneChoices.find((z) => z.id === b.zoneId)?.name;
            showToast(b.zoneId !== bench.zoneId && zoneName ? `${b.name} moved to ${zoneName}` : `${b.name} saved`);
            onClose();
          },
          onError,
        },
      );
    } else {
      const input = validate(createBenchInputSchema, { zoneId: toZoneId, name }, formRef.current);
      if (!input) return;
      create.mutate(input, { onSuccess: ({ bench: b }) => {
            showToast(`${b.name} added`);
            onClose();
          }, onError });
    }
  }

  return (
    <Dialog title={bench ? `Edit ${bench.name}` : "Add a bench"} onClose={onClose}>
      <form ref={formRef} onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
        {errors.form && <Notice tone="error">{errors.form}</Notice>}
        <TextField label="Name" value={name} onChange={(e) => {
            setName(e.target.value);
            clearField("name");
          }} error={errors.fields.name} autoComplete="off" />
        {bench && zoneChoices.length > 1 && (
          <SelectField
            label="Zone"
            hint="A bench moved to another zone keeps its readings and its own windows, and follows the new zone's windows for the rest."
            value={String(toZoneId)}
            onChange={(e) => {
            setToZoneId(Number(e.target.value));
            clearField("zoneId");
          }}
            error={errors.fields.zoneId}
          >
            {zoneChoices.map((z) => (
              <option key={z.id} value={z.id}>
                {z.name}
              </option>
            ))}
          </SelectField>
        )}
        <Actions onClose={onClose} isBusy={create.isPending || update.isPending} label={bench ? "Save" : "Add bench"} />
      </form>
    </Dialog>
  );
}
