import { useMutation, useQueryClient } from "@tanstack/react-query";
import { sensorSecretResponseSchema, type RegisterSensorInput, type SensorSecretResponse } from "../../../../shared/schemas/sensors.js";
import { apiSend } from "../../../lib/api-client";
import { getSensorsQueryOptions } from "./get-sensors";

/** POST /api/sensors (admin): 201 with the new secret, the only time it is ever sent. 409 sensor-id-taken. */
export function registerSensor(input: RegisterSensorInput): Promise<SensorSecretResponse> {
  return apiSend("POST", "/api/sensors", sensorSecretResponseSchema, { body: input });
}

export function useRegisterSensor() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: registerSensor,
    // The answer holds the secret: keep it out of the mutation cache once nobody shows it.
    gcTime: 0,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: getSensorsQueryOptions().queryKey }),
  });
}
