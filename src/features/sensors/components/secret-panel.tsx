import { useId } from "react";
import type { SensorSecretResponse } from "../../../../shared/schemas/sensors.js";
import { Button } from "../../../components/ui/button";
import { CopyButton } from "../../../components/ui/copy-button";
import { Dialog } from "../../../components/ui/dialog";
import { Notice } from "../../../components/ui/notice";
import { readingsTopic } from "../utils/describe-sensor";

export type RevealedSecret = SensorSecretResponse & { reason: "registered" | "rotated" };

type SecretPanelProps = { revealed: RevealedSecret; onClose: () => void };

/**
 * The one and only view of a sensor's secret. The server keeps a hash, so once this closes
 * the secret exists only where the admin put it. Only the close button closes it: a stray tap
 * on the backdrop or Escape must not lose it.
 */
export function SecretPanel({ revealed, onClose }: SecretPanelProps) {
  const secretInputId = useId();
  const { sensor, secret, reason } = revealed;
  return (
    <Dialog
      title={reason === "registered" ? `${sensor.id} is registered` : `New secret for ${sensor.id}`}
      onClose={onClose}
      isDismissable={false}
      className="max-w-2xl"
      actions={
        <Button variant="primary" onClick={onClose}>
          I have stored it, close
        </Button>
      }
    >
      <div className="flex flex-col gap-4">
        <Notice tone="warning" title="Shown only this once">
          Benchwarden does not keep this secret and cannot show it again. Put it on the probe (or in its setup file) now.
          If it is lost, make a new one with "New secret".
          {reason === "rotated" && " The old secret stopped working just now; the probe stays offline until it has this one."}
        </Notice>
        <div className="flex flex-col gap-1">
          <label htmlFor={secretInputId} className="text-lg font-semibold">
            Secret (the probe's MQTT password)
          </label>
          <input
            id={secretInputId}
            readOnly
            value={secret}
            onFocus={(e) => e.currentTarget.select()}
            spellCheck={false}
            autoComplete="off"
            data-testid="sensor-secret"
            className="min-h-touch w-full rounded-lg border-2 border-ink bg-page px-3 py-2 font-mono text-lg text-ink"
          />
          <div className="mt-1">
            <CopyButton text={secret} targetId={secretInputId} label="Copy secret" />
          </div>
        </div>
        <dl className="grid gap-x-4 gap-y-1 text-base sm:grid-cols-[auto_1fr]">
          <dt className="font-semibold">MQTT user name</dt>
          <dd className="break-all font-mono">{sensor.id}</dd>
          <dt className="font-semibold">Publishes to</dt>
          <dd className="break-all font-mono">{readingsTopic(sensor.id)}</dd>
        </dl>
      </div>
    </Dialog>
  );
}
