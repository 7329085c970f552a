import { useRef, useState, type FormEvent } from "react";
import { updateSensorInputSchema, type SensorView } from "../../../../shared/schemas/sensors.js";
import { Button } from "../../../components/ui/button";
import { Dialog } from "../../../components/ui/dialog";
import { Notice } from "../../../components/ui/notice";
import { useToast } from "../../../components/ui/toast";
import { useFormErrors } from "../../../lib/form";
import { useUpdateSensor } from "../api/update-sensor";
import { describeBench, type BenchChoices } from "../utils/describe-sensor";
import { BenchSelect, NO_BENCH, benchIdFromValue } from "./bench-select";

const FIELDS = ["benchId"] as const;

type MoveSensorDialogProps = { sensor: SensorView; benchChoices: BenchChoices; onClose: () => void; onMoved?: () => void };

/** Puts a probe on another bench. Readings already stored stay with the bench they were taken on. */
export function MoveSensorDialog({ sensor, benchChoices, onClose, onMoved }: MoveSensorDialogProps) {
  const formRef = useRef<HTMLFormElement>(null);
  const [benchValue, setBenchValue] = useState(sensor.benchId === null ? NO_BENCH : String(sensor.benchId));
  const { errors, validate, showServerError, clearField } = useFormErrors({ fields: FIELDS });
  const update = useUpdateSensor();
  const { showToast } = useToast();
  const isUnchanged = benchIdFromValue(benchValue) === sensor.benchId;

  function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const input = validate(updateSensorInputSchema, { benchId: benchIdFromValue(benchValue) }, formRef.current);
    if (!input) return;
    update.mutate(
      { sensorId: sensor.id, input },
      {
        onSuccess: ({ sensor: moved }) => {
          showToast(moved.benchId === null ? `${moved.id} is off its bench` : `${moved.id} moved to ${describeBench(moved)}`);
          onMoved?.();
          onClose();
        },
        onError: (error) => showServerError(error, formRef.current),
      },
    );
  }

  return (
    <Dialog title={`Move ${sensor.id}`} onClose={onClose}>
      <form ref={formRef} onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
        <p>
          Now on: <strong>{describeBench(sensor)}</strong>. Readings already stored stay with the bench they were taken on.
        </p>
        {errors.form && <Notice tone="error">{errors.form}</Notice>}
        <BenchSelect
          label="Move to"
          name="benchId"
          choices={benchChoices}
          value={benchValue}
          onChange={(e) => {
            setBenchValue(e.target.value);
            clearField("benchId");
          }}
          error={errors.fields.benchId}
        />
        <div className="flex flex-wrap justify-end gap-3">
          <Button onClick={onClose}>Cancel</Button>
          <Button type="submit" variant="primary" isBusy={update.isPending} disabled={isUnchanged}>
            Move
          </Button>
        </div>
      </form>
    </Dialog>
  );
}
