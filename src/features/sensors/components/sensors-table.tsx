import { useState } from "react";
import type { SensorSecretResponse, SensorView } from "../../../../shared/schemas/sensors.js";
import { Button } from "../../../components/ui/button";
import { ConfirmDialog } from "../../../components/ui/dialog";
import { Table, TableBody, TableHead, Td, Th, Tr } from "../../../components/ui/table";
import { useToast } from "../../../components/ui/toast";
import { useNow } from "../../../hooks/use-now";
import { formatDateTime } from "../../../lib/format-time";
import { useSensors } from "../api/get-sensors";
import { useRotateSensorSecret } from "../api/rotate-sensor-secret";
import { useUpdateSensor } from "../api/update-sensor";
import {
  LOW_BATTERY_PCT,
  SENSOR_KIND_LABELS,
  SENSOR_STATE_LABELS,
  describeBattery,
  describeBench,
  describeLastSeen,
  sensorState,
  type BenchChoices,
  type SensorState,
} from "../utils/describe-sensor";
import { CalibrateSensorDialog } from "./calibrate-sensor-dialog";
import { MoveSensorDialog } from "./move-sensor-dialog";

const STATE_CLASSES: Record<SensorState, string> = {
  reporting: "bg-ok-soft text-ok border-transparent",
  quiet: "bg-high text-on-status border-transparent",
  never: "bg-none-soft text-muted border-line",
  disabled: "bg-none-soft text-muted border-line",
};

type SensorsTableProps = {
  benchChoices: BenchChoices;
  onRotated: (result: SensorSecretResponse) => void;
  /** A probe moved, was disabled or enabled: what the dashboard shows about benches changed. */
  onChanged?: () => void;
};

export function SensorsTable({ benchChoices, onRotated, onChanged }: SensorsTableProps) {
  const { data } = useSensors();
  const nowMs = useNow(30_000);
  // Working probes first (in id order, as the server sends them), disabled ones at the end.
  const sensors = [...data.sensors].sort((a, b) => Number(a.disabled) - Number(b.disabled));
  if (sensors.length === 0) {
    return <p className="text-lg text-muted">No sensors registered yet. Register the first one below.</p>;
  }
  return (
    <Table caption="Sensors" stackBelow="lg">
      <TableHead>
        <Th>Sensor</Th>
        <Th>Bench</Th>
        <Th>Kind</Th>
        <Th>Last seen</Th>
        <Th>Battery</Th>
        <Th>Status</Th>
        <Th>
          <span className="sr-only">Actions</span>
        </Th>
      </TableHead>
      <TableBody>
        {sensors.map((sensor) => (
          <SensorRow key={sensor.id} sensor={sensor} nowMs={nowMs} benchChoices={benchChoices} onRotated={onRotated} onChanged={onChanged} />
        ))}
      </TableBody>
    </Table>
  );
}

type SensorRowProps = { sensor: SensorView; nowMs: number } & SensorsTableProps;
type Open = "move" | "calibrate" | "rotate" | "disable" | null;

function SensorRow({ sensor, nowMs, benchChoices, onRotated, onChanged }: SensorRowProps) {
  const [open, setOpen] = useState<Open>(null);
  const rotate = useRotateSensorSecret();
  const update = useUpdateSensor();
  const { showToast } = useToast();
  const state = sensorState(sensor, nowMs);
  const isBatteryLow = sensor.batteryPct !== null && sensor.batteryPct < LOW_BATTERY_PCT;

  function onRotate() {
    rotate.mutate(sensor.id, {
      onSuccess: (result) => {
        setOpen(null);
        rotate.reset();
        onRotated(result);
      },
      onError: (error) => {
        setOpen(null);
        showToast(`No new secret for ${sensor.id}: ${error.message}`, "error");
      },
    });
  }

  function setDisabled(disabled: boolean) {
    update.mutate(
      { sensorId: sensor.id, input: { disabled } },
      {
        onSuccess: () => {
          setOpen(null);
          showToast(disabled ? `${sensor.id} is disabled` : `${sensor.id} is enabled and may connect again`);
          onChanged?.();
        },
        onError: (error) => {
          setOpen(null);
          showToast(`${sensor.id}: ${error.message}`, "error");
        },
      },
    );
  }

  return (
    <Tr data-sensor-id={sensor.id} className={sensor.disabled ? "text-muted" : ""}>
      <Td label="Sensor">
        <span className="break-all font-mono font-semibold text-ink lg:whitespace-nowrap lg:break-normal">{sensor.id}</span>
      </Td>
      <Td label="Bench">{describeBench(sensor)}</Td>
      <Td label="Kind">
        {SENSOR_KIND_LABELS[sensor.kind]}
        {Object.keys(sensor.calibration).length > 0 && <span className="block text-base text-muted">Calibrated</span>}
      </Td>
      <Td label="Last seen">
        <span title={sensor.lastSeenMs === null ? undefined : formatDateTime(sensor.lastSeenMs)}>{describeLastSeen(sensor.lastSeenMs, nowMs)}</span>
      </Td>
      <Td label="Battery" className={isBatteryLow ? "font-bold text-high" : ""}>
        {describeBattery(sensor.batteryPct)}
      </Td>
      <Td label="Status">
        <span className={`inline-block whitespace-nowrap rounded-full border px-3 py-0.5 text-base font-semibold ${STATE_CLASSES[state]}`}>
          {SENSOR_STATE_LABELS[state]}
        </span>
      </Td>
      <Td label="Actions">
        <div className="flex flex-wrap gap-2">
          <Button onClick={() => setOpen("move")}>
            Move<span className="sr-only"> {sensor.id}</span>
          </Button>
          <Button onClick={() => setOpen("calibrate")}>
            Calibrate<span className="sr-only"> {sensor.id}</span>
          </Button>
          <Button onClick={() => setOpen("rotate")}>
            New secret<span className="sr-only"> for {sensor.id}</span>
          </Button>
          {sensor.disabled ? (
            <Button isBusy={update.isPending} onClick={() => setDisabled(false)}>
              Enable<span className="sr-only"> {sensor.id}</span>
            </Button>
          ) : (
            <Button onClick={() => setOpen("disable")}>
              Disable<span className="sr-only"> {sensor.id}</span>
            </Button>
          )}
        </div>
        {open === "move" && <MoveSensorDialog sensor={sensor} benchChoices={benchChoices} onClose={() => setOpen(null)} onMoved={onChanged} />}
        {open === "calibrate" && <CalibrateSensorDialog sensor={sensor} onClose={() => setOpen(null)} />}
        {open === "rotate" && (
          <ConfirmDialog
            title={`Make a new secret for ${sensor.id}?`}
            confirmLabel="Make new secret"
            confirmVariant="danger"
            isBusy={rotate.isPending}
            onCancel={() => setOpen(null)}
            onConfirm={onRotate}
          >
            <p>
              The current secret stops working at once and a connected probe is cut off. It can connect again only once it
              has the new secret, which is shown one time.
            </p>
          </ConfirmDialog>
        )}
        {open === "disable" && (
          <ConfirmDialog
            title={`Disable ${sensor.id}?`}
            confirmLabel="Disable"
            confirmVariant="danger"
            isBusy={update.isPending}
            onCancel={() => setOpen(null)}
            onConfirm={() => setDisabled(true)}
          >
            <p>
              The probe is cut off and refused until it is enabled again, so its bench gets no readings from it. Readings
              already stored are kept.
            </p>
          </ConfirmDialog>
        )}
      </Td>
    </Tr>
  );
}
