import { useRef, useState, type FormEvent } from "react";
import { describeDurationS } from "../../../../shared/domain/duration.js";
import { ALERT_TIMING_LIMITS_S, siteAlertTimingInputSchema, type SiteAlertTiming, type SiteAlertTimingInput } from "../../../../shared/schemas/alerts.js";
import { Button } from "../../../components/ui/button";
import { TextField } from "../../../components/ui/form";
import { Notice } from "../../../components/ui/notice";
import { useToast } from "../../../components/ui/toast";
import { ALLOWED, useAuthorization } from "../../../lib/authorization";
import { errorsFromApi, errorsFromZod, focusFirstInvalid, type FormErrors } from "../../../lib/form";
import { useDutyRota } from "../api/get-duty-rota";
import { useUpdateSiteAlertTiming } from "../api/update-site-alert-timing";

const FIELDS = ["escalateAfterS", "renotifyEveryS"] as const;
type Field = (typeof FIELDS)[number];
const NO_ERRORS: FormErrors = { fields: {}, form: null };

/** What the form holds: minutes as typed; empty means the server's default. */
export type AlertTimingValues = Record<Field, string>;

function minutesText(seconds: number | null): string {
  return seconds === null ? "" : String(seconds / 60);
}

function secondsFromMinutes(text: string): number | null {
  const trimmed = text.trim();
  return trimmed === "" ? null : Number(trimmed) * 60;
}

/** The typed minutes checked with the shared siteAlertTimingInputSchema (the one the server runs). */
export function validateAlertTiming(values: AlertTimingValues): { input: SiteAlertTimingInput | null; errors: FormErrors } {
  const parsed = siteAlertTimingInputSchema.safeParse({
    escalateAfterS: secondsFromMinutes(values.escalateAfterS),
    renotifyEveryS: secondsFromMinutes(values.renotifyEveryS),
  });
  return parsed.success ? { input: parsed.data, errors: NO_ERRORS } : { input: null, errors: errorsFromZod(parsed.error, FIELDS) };
}

/** "20 minutes", or "20 minutes (the default)" where the site has no setting of its own. */
function describeSetting(seconds: number | null, defaultS: number): string {
  return seconds === null ? `${describeDurationS(defaultS)} (the default)` : describeDurationS(seconds);
}

/** "Leave empty for the default, 20 minutes. From 5 minutes to 12 hours." */
function hintFor(field: Field, defaultS: number): string {
  const { min, max } = ALERT_TIMING_LIMITS_S[field];
  return `Leave empty for the default, ${describeDurationS(defaultS)}. From ${describeDurationS(min)} to ${describeDurationS(max)}.`;
}

/**
 * Per site, what happens when nobody acknowledges a raised alert: after how long the managers
 * are mailed, and how often the person on duty is reminded. Admins and managers change it; the
 * others read it.
 */
export function AlertTiming() {
  const { data: rota } = useDutyRota();
  const { isAllowed } = useAuthorization();
  const canEdit = isAllowed(ALLOWED.manageGrowing);
  return (
    <section aria-labelledby="alert-timing-heading" className="flex flex-col gap-3">
      <h2 id="alert-timing-heading" className="text-2xl font-bold">
        When nobody acknowledges
      </h2>
      <p className="max-w-3xl text-lg text-muted">
        When an alert is raised and nobody acknowledges it, the managers are told after a while, and the person on duty keeps getting
        reminders until someone does.
        {!canEdit && " Only managers and admins change these times."}
      </p>
      {rota.alertTiming.length === 0 ? (
        <p className="text-lg text-muted">No sites are set up yet.</p>
      ) : (
        <div className="grid gap-3 lg:grid-cols-2">
          {rota.alertTiming.map((site) =>
            canEdit ? <AlertTimingForm key={site.siteId} site={site} /> : <AlertTimingText key={site.siteId} site={site} />,
          )}
        </div>
      )}
    </section>
  );
}

function AlertTimingText({ site }: { site: SiteAlertTiming }) {
  return (
    <div className="rounded-xl border-2 border-line bg-surface p-4" data-site-id={site.siteId}>
      <h3 className="text-xl font-bold">{site.siteName}</h3>
      <ul className="mt-2 flex flex-col gap-1 text-lg">
        <li>
          The managers are told after <strong>{describeSetting(site.escalateAfterS, site.defaultEscalateAfterS)}</strong>.
        </li>
        <li>
          The person on duty is reminded every <strong>{describeSetting(site.renotifyEveryS, site.defaultRenotifyEveryS)}</strong>.
        </li>
      </ul>
    </div>
  );
}

function AlertTimingForm({ site }: { site: SiteAlertTiming }) {
  const formRef = useRef<HTMLFormElement>(null);
  const [values, setValues] = useState<AlertTimingValues>(() => ({
    escalateAfterS: minutesText(site.escalateAfterS),
    renotifyEveryS: minutesText(site.renotifyEveryS),
  }));
  const [errors, setErrors] = useState<FormErrors>(NO_ERRORS);
  const update = useUpdateSiteAlertTiming();
  const { showToast } = useToast();

  function change(field: Field, text: string) {
    setValues((current) => ({ ...current, [field]: text }));
    setErrors((current) => {
      const rest = { ...current.fields };
      delete rest[field];
      return { fields: rest, form: current.form };
    });
  }

  function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const result = validateAlertTiming(values);
    setErrors(result.errors);
    if (!result.input) {
      focusFirstInvalid(formRef.current);
      return;
    }
    update.mutate(
      { siteId: site.siteId, input: result.input },
      {
        onSuccess: () => showToast(`Saved for ${site.siteName}`),
        onError: (error) => {
          setErrors(errorsFromApi(error, { fields: FIELDS }));
          focusFirstInvalid(formRef.current);
        },
      },
    );
  }

  return (
    <form
      ref={formRef}
      onSubmit={onSubmit}
      noValidate
      aria-label={`When nobody acknowledges at ${site.siteName}`}
      data-site-id={site.siteId}
      className="flex flex-col gap-4 rounded-xl border-2 border-line bg-surface p-4"
    >
      <h3 className="text-xl font-bold">{site.siteName}</h3>
      {errors.form && <Notice tone="error">{errors.form}</Notice>}
      <TextField
        label="Tell the managers after"
        name="escalateAfterS"
        value={values.escalateAfterS}
        hint={hintFor("escalateAfterS", site.defaultEscalateAfterS)}
        error={errors.fields.escalateAfterS}
        onChange={(e) => change("escalateAfterS", e.target.value)}
        inputMode="numeric"
        autoComplete="off"
        unit="minutes"
      />
      <TextField
        label="Remind the person on duty every"
        name="renotifyEveryS"
        value={values.renotifyEveryS}
        hint={hintFor("renotifyEveryS", site.defaultRenotifyEveryS)}
        error={errors.fields.renotifyEveryS}
        onChange={(e) => change("renotifyEveryS", e.target.value)}
        inputMode="numeric"
        autoComplete="off"
        unit="minutes"
      />
      <Button type="submit" variant="primary" className="self-start" isBusy={update.isPending}>
        Save times
      </Button>
    </form>
  );
}
