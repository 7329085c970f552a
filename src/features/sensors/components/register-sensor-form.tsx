import { useRef, useState, type FormEvent } from "react";
import { sensorKindSchema, type SensorKind } from "../../../../shared/schemas/quantities.js";
import { registerSensorInputSchema, type SensorSecretResponse } from "../../../../shared/schemas/sensors.js";
import { Button } from "../../../components/ui/button";
import { ChoiceField, TextField } from "../../../components/ui/form";
import { Notice } from "../../../components/ui/notice";
import { useFormErrors } from "../../../lib/form";
import { useRegisterSensor } from "../api/register-sensor";
import { SENSOR_KIND_DESCRIPTIONS, SENSOR_KIND_LABELS, type BenchChoices } from "../utils/describe-sensor";
import { BenchSelect, NO_BENCH, benchIdFromValue } from "./bench-select";

const FIELDS = ["id", "kind", "benchId"] as const;

const KIND_CHOICES = sensorKindSchema.options.map((kind) => ({
  value: kind,
  label: SENSOR_KIND_LABELS[kind],
  description: SENSOR_KIND_DESCRIPTIONS[kind],
}));

type RegisterSensorFormProps = {
  benchChoices: BenchChoices;
  /** Receives the answer with the secret; the form keeps no copy of it. */
  onRegistered: (result: SensorSecretResponse) => void;
};

export function RegisterSensorForm({ benchChoices, onRegistered }: RegisterSensorFormProps) {
  const formRef = useRef<HTMLFormElement>(null);
  const [id, setId] = useState("");
  const [kind, setKind] = useState<SensorKind>("combined");
  const [benchValue, setBenchValue] = useState(NO_BENCH);
  const { errors, validate, showServerError, clearField, reset } = useFormErrors({ fields: FIELDS });
  const register = useRegisterSensor();

  function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const input = validate(registerSensorInputSchema, { id, kind, benchId: benchIdFromValue(benchValue) }, formRef.current);
    if (!input) return;
    register.mutate(input, {
      onSuccess: (result) => {
        // Hand the secret over and drop the mutation's copy of it.
        register.reset();
        setId("");
        setBenchValue(NO_BENCH);
        reset();
        onRegistered(result);
      },
      onError: (error) => showServerError(error, formRef.current),
    });
  }

  return (
    <form ref={formRef} onSubmit={onSubmit} noValidate aria-label="Register a sensor" className="flex flex-col gap-4">
      {errors.form && <Notice tone="error">{errors.form}</Notice>}
      <div className="grid gap-4 sm:grid-cols-2">
        <TextField
          label="Sensor id"
          name="id"
          hint="Letters, digits, - and _. It is also the probe's MQTT user name."
          autoComplete="off"
          autoCapitalize="none"
          spellCheck={false}
          value={id}
          onChange={(e) => {
            setId(e.target.value);
            clearField("id");
          }}
          error={errors.fields.id}
        />
        <BenchSelect
          label="Bench"
          name="benchId"
          hint="Where the probe sits. It can move later."
          choices={benchChoices}
          value={benchValue}
          onChange={(e) => {
            setBenchValue(e.target.value);
            clearField("benchId");
          }}
          error={errors.fields.benchId}
        />
      </div>
      <ChoiceField
        legend="Kind"
        name="kind"
        value={kind}
        options={KIND_CHOICES}
        onChange={(next) => {
          setKind(next);
          clearField("kind");
        }}
        error={errors.fields.kind}
      />
      <Button type="submit" variant="primary" isBusy={register.isPending} className="self-start">
        Register and make its secret
      </Button>
    </form>
  );
}
