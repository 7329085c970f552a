import { useMutation, useQueryClient } from "@tanstack/react-query";
import { z } from "zod";
import { sensorSchema, type UpdateSensorInput } from "../../../../shared/schemas/sensors.js";
import { apiSend } from "../../../lib/api-client";
import { getSensorsQueryOptions } from "./get-sensors";

const updateSensorResponseSchema = z.object({ sensor: sensorSchema });

/** PATCH /api/sensors/:id (admin): move to another bench (or none), disable or enable. */
export function updateSensor({ sensorId, input }: { sensorId: string; input: UpdateSensorInput }) {
  return apiSend("PATCH", `/api/sensors/${encodeURIComponent(sensorId)}`, updateSensorResponseSchema, { body: input });
}

export function useUpdateSensor() {
  const queryClient = useQueryClient();
  const queryKey = getSensorsQueryOptions().queryKey;
  return useMutation({
    mutationFn: updateSensor,
    onSuccess: ({ sensor }) => {
      queryClient.setQueryData(queryKey, (current) =>
        current ? { sensors: current.sensors.map((s) => (s.id === sensor.id ? sensor : s)) } : current,
      );
      return queryClient.invalidateQueries({ queryKey });
    },
  });
}
