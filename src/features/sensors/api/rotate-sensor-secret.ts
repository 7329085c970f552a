import { useMutation, useQueryClient } from "@tanstack/react-query";
import { sensorSecretResponseSchema, type SensorSecretResponse } from "../../../../shared/schemas/sensors.js";
import { apiSend } from "../../../lib/api-client";
import { getSensorsQueryOptions } from "./get-sensors";

/** POST /api/sensors/:id/secret (admin): a new secret; the old one stops working and the probe is cut off. */
export function rotateSensorSecret(sensorId: string): Promise<SensorSecretResponse> {
  return apiSend("POST", `/api/sensors/${encodeURIComponent(sensorId)}/secret`, sensorSecretResponseSchema);
}

export function useRotateSensorSecret() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: rotateSensorSecret,
    gcTime: 0,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: getSensorsQueryOptions().queryKey }),
  });
}
