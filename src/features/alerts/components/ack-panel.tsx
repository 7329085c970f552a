import { useRef, useState, type FormEvent } from "react";
import { acknowledgeInputSchema, type AckLinkResponse } from "../../../../shared/schemas/alerts.js";
import { ErrorMessage } from "../../../components/errors/error-message";
import { TemperatureUnitSwitch } from "../../../components/layouts/temperature-unit-switch";
import { Button } from "../../../components/ui/button";
import { TextAreaField } from "../../../components/ui/form";
import { LinkButton } from "../../../components/ui/link-button";
import { Loading } from "../../../components/ui/loading";
import { Notice } from "../../../components/ui/notice";
import { paths } from "../../../config/paths";
import { useNow } from "../../../hooks/use-now";
import { alertTitle } from "../../../lib/alert-words";
import { isApiError } from "../../../lib/api-client";
import { formatDateTime } from "../../../lib/format-time";
import { useFormErrors } from "../../../lib/form";
import { useTemperatureUnit } from "../../../lib/temperature-unit";
import { useAcknowledgeWithLink } from "../api/acknowledge-with-link";
import { useAckLink } from "../api/get-ack-link";
import { AlertCard } from "./alert-card";

const FIELDS = ["note"] as const;

function isGone(error: unknown, code: string): boolean {
  return isApiError(error) && error.status === 410 && error.code === code;
}

/** Where to look after the link: the alerts page, through sign-in when signed out. */
function DashboardLinks() {
  return (
    <div className="flex flex-col gap-3">
      <LinkButton to={paths.alerts.to()}>Open the alerts page</LinkButton>
      <LinkButton to={paths.dashboard.to()} variant="quiet">
        All benches
      </LinkButton>
    </div>
  );
}

/** An expired or broken link: say so, and point to the signed-in way. */
export function AckLinkNotValid({ reason }: { reason?: "missing" }) {
  return (
    <div className="flex flex-col gap-4">
      <Notice tone="error" title="This link can't be used">
        {reason === "missing"
          ? "The address is missing the part that identifies the link. Open the link from the e-mail again, whole."
          : "It has expired or is not valid. Sign in to see the alert and acknowledge it there."}
      </Notice>
      <DashboardLinks />
    </div>
  );
}

/**
 * The page an alert e-mail's link opens, signed out, on a phone. Opening it only reads the link
 * (GET); one tap on "I've got it" acknowledges every still-raised alert of the link as the
 * person it was sent to, and the page then confirms who acknowledged what.
 */
export function AckPanel({ token }: { token: string }) {
  const link = useAckLink(token);
  if (link.isPending) return <Loading label="Checking the link…" />;
  if (link.isError) return isGone(link.error, "link-not-valid") ? <AckLinkNotValid /> : <ErrorMessage error={link.error} />;
  return <AckForm token={token} link={link.data} />;
}

function AckForm({ token, link }: { token: string; link: AckLinkResponse }) {
  const formRef = useRef<HTMLFormElement>(null);
  const [note, setNote] = useState("");
  const [isNoteOpen, setIsNoteOpen] = useState(false);
  const { errors, validate, showServerError, clearField } = useFormErrors({ fields: FIELDS });
  const acknowledge = useAcknowledgeWithLink();
  const { unit } = useTemperatureUnit();
  const nowMs = useNow();
  const raisedCount = link.alerts.filter((a) => a.phase === "raised").length;
  const [tappedIds, setTappedIds] = useState<number[]>([]);

  function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const input = validate(acknowledgeInputSchema, note.trim() ? { note } : {}, formRef.current);
    if (!input) return;
    setTappedIds(link.alerts.filter((a) => a.phase === "raised").map((a) => a.id));
    acknowledge.mutate({ token, input }, { onError: (error) => showServerError(error, formRef.current) });
  }

  const refusal = acknowledge.error;
  const isRefused = isGone(refusal, "already-acknowledged");
  const isExpired = isGone(refusal, "link-not-valid");
  if (isExpired) return <AckLinkNotValid />;

  // The alerts still waiting for someone come first, right above the button; the rest of the
  // e-mail's alerts (cleared or taken since) follow, so the button is never a long scroll away.
  const canTap = link.canAcknowledge && !isRefused;
  const waiting = canTap ? link.alerts.filter((a) => a.phase === "raised") : link.alerts;
  const rest = canTap ? link.alerts.filter((a) => a.phase !== "raised") : [];
  const alertList = (alerts: typeof link.alerts, label: string) => (
    <ul aria-label={label} className="flex flex-col gap-3">
      {alerts.map((alert) => (
        <li key={alert.id}>
          <AlertCard alert={alert} unit={unit} nowMs={nowMs} />
        </li>
      ))}
    </ul>
  );

  if (acknowledge.isSuccess) {
    const answer = acknowledge.data;
    // What this tap took: the alerts that were raised when it was made and are now acknowledged by this person.
    const done = answer.alerts.filter((a) => tappedIds.includes(a.id) && a.phase === "acknowledged");
    const atMs = Math.max(0, ...done.map((a) => a.acknowledgedAtMs ?? 0));
    const first = done[0];
    const byName = first?.acknowledgedByName ?? answer.recipientName;
    const sorted = [...answer.alerts].sort((a, b) => Number(!tappedIds.includes(a.id)) - Number(!tappedIds.includes(b.id)));
    return (
      <div className="flex flex-col gap-4">
        <Notice tone="success" title="Got it: acknowledged">
          {done.length === 1 && first ? (
            <>
              <strong>{alertTitle(first)}</strong> on {first.benchName} is acknowledged by <strong>{byName}</strong>
            </>
          ) : (
            <>
              {done.length} alerts are acknowledged by <strong>{byName}</strong>
            </>
          )}
          {atMs > 0 && <> at {formatDateTime(atMs)}</>}. Reminders stop; everyone on the dashboard sees that you have it.
        </Notice>
        {alertList(sorted, "Acknowledged alerts")}
        <DashboardLinks />
      </div>
    );
  }

  return (
    <div className="flex flex-col gap-4">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <p className="text-lg">
          For <strong>{link.recipientName}</strong>
        </p>
        <TemperatureUnitSwitch />
      </div>
      {!canTap && alertList(waiting, "Alerts in this e-mail")}
      {isRefused ? (
        <Notice tone="warning" title="Someone already has it">
          {refusal?.message}. Nothing was changed.
        </Notice>
      ) : !link.canAcknowledge ? (
        <Notice tone="info" title="Nothing left to acknowledge">
          {describeNothingLeft(link)}
        </Notice>
      ) : (
        // The list sits inside the form so the button can stay in view at the bottom of a phone's
        // screen while the alerts above it scroll by.
        <form ref={formRef} onSubmit={onSubmit} noValidate aria-label="Acknowledge" className="flex flex-col gap-3">
          {alertList(waiting, "Alerts in this e-mail")}
          {errors.form && <Notice tone="error">{errors.form}</Notice>}
          {isNoteOpen ? (
            <TextAreaField
              label="Note (optional)"
              name="note"
              hint="What you are doing about it."
              value={note}
              maxLength={500}
              autoFocus
              onChange={(e) => {
                setNote(e.target.value);
                clearField("note");
              }}
              error={errors.fields.note}
            />
          ) : (
            <Button variant="quiet" onClick={() => setIsNoteOpen(true)} className="self-start">
              + Add a note
            </Button>
          )}
          <div className="sticky bottom-0 -mx-5 border-t-2 border-line bg-surface px-5 pb-4 pt-3 sm:-mx-7 sm:px-7">
            <Button type="submit" variant="primary" isBusy={acknowledge.isPending} className="w-full py-5 text-2xl">
              I've got it
            </Button>
          </div>
          <p className="text-base text-muted">
            One tap acknowledges {raisedCount === 1 ? "this alert" : `these ${raisedCount} alerts`} as {link.recipientName}. Opening this page
            changed nothing.
          </p>
        </form>
      )}
      {rest.length > 0 && (
        <section aria-labelledby="ack-rest-heading" className="flex flex-col gap-3">
          <h2 id="ack-rest-heading" className="text-xl font-bold">
            Also in this e-mail, no longer waiting
          </h2>
          {alertList(rest, "Alerts no longer waiting")}
        </section>
      )}
      {(isRefused || !link.canAcknowledge) && <DashboardLinks />}
    </div>
  );
}

function describeNothingLeft(link: AckLinkResponse): string {
  const taken = link.alerts.find((a) => a.acknowledgedByName !== null && a.phase !== "cleared");
  if (taken) return `Already acknowledged by ${taken.acknowledgedByName}.`;
  if (link.alerts.every((a) => a.phase === "cleared")) return "These alerts have cleared: the benches are back in their window.";
  return "None of these alerts is waiting for someone.";
}
