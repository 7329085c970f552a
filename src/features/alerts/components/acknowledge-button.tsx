import { useRef, useState, type FormEvent } from "react";
import { acknowledgeInputSchema, type AlertView } from "../../../../shared/schemas/alerts.js";
import { Button } from "../../../components/ui/button";
import { Dialog } from "../../../components/ui/dialog";
import { TextAreaField } from "../../../components/ui/form";
import { Notice } from "../../../components/ui/notice";
import { useToast } from "../../../components/ui/toast";
import { alertTitle } from "../../../lib/alert-words";
import { ALLOWED, Authorized } from "../../../lib/authorization";
import { useFormErrors } from "../../../lib/form";
import { useAcknowledgeAlert } from "../api/acknowledge-alert";

const FIELDS = ["note"] as const;

type AcknowledgeButtonProps = { alert: AlertView; className?: string };

/**
 * "I've got it" for a raised alert, for the roles that may acknowledge (admin, manager, grower);
 * nothing for a viewer or an alert that is not raised. Opens a short form with an optional note.
 */
export function AcknowledgeButton({ alert, className = "" }: AcknowledgeButtonProps) {
  const [isOpen, setIsOpen] = useState(false);
  if (alert.phase !== "raised") return null;
  return (
    <Authorized roles={ALLOWED.recordWork}>
      <Button
        variant="primary"
        onClick={() => setIsOpen(true)}
        aria-label={`I've got it: acknowledge ${alertTitle(alert)} on ${alert.benchName}`}
        className={className}
      >
        I've got it
      </Button>
      {isOpen && <AcknowledgeDialog alert={alert} onClose={() => setIsOpen(false)} />}
    </Authorized>
  );
}

function AcknowledgeDialog({ alert, onClose }: { alert: AlertView; onClose: () => void }) {
  const formRef = useRef<HTMLFormElement>(null);
  const [note, setNote] = useState("");
  const { errors, validate, showServerError, clearField } = useFormErrors({ fields: FIELDS });
  const acknowledge = useAcknowledgeAlert();
  const { showToast } = useToast();

  function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const input = validate(acknowledgeInputSchema, note.trim() ? { note } : {}, formRef.current);
    if (!input) return;
    acknowledge.mutate(
      { alertId: alert.id, input },
      {
        onSuccess: ({ alert: done }) => {
          showToast(`Acknowledged: ${done.benchName} · ${alertTitle(done)}`);
          onClose();
        },
        onError: (error) => showServerError(error, formRef.current),
      },
    );
  }

  return (
    <Dialog title="Acknowledge this alert" onClose={onClose}>
      <form ref={formRef} onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Acknowledge this alert">
        <p>
          <strong>
            {alert.benchName} · {alertTitle(alert)}
          </strong>
          <br />
          <span className="text-muted">{alert.zoneName}</span>
        </p>
        <p className="text-base text-muted">The people on duty stop getting reminders; everyone sees that you took it.</p>
        {errors.form && <Notice tone="error">{errors.form}</Notice>}
        <TextAreaField
          label="Note (optional)"
          name="note"
          hint="What you are doing about it, e.g. “Reset the heater, checking again at 4”."
          value={note}
          maxLength={500}
          onChange={(e) => {
            setNote(e.target.value);
            clearField("note");
          }}
          error={errors.fields.note}
        />
        <div className="flex flex-wrap justify-end gap-3">
          <Button onClick={onClose}>Cancel</Button>
          <Button type="submit" variant="primary" isBusy={acknowledge.isPending} data-autofocus>
            Acknowledge
          </Button>
        </div>
      </form>
    </Dialog>
  );
}
