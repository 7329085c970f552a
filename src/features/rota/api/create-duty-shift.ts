import { useMutation, useQueryClient } from "@tanstack/react-query";
import { z } from "zod";
import { dutyShiftSchema, type DutyShiftInput } from "../../../../shared/schemas/alerts.js";
import { apiSend } from "../../../lib/api-client";
import { getDutyRotaQueryOptions } from "./get-duty-rota";

export const dutyShiftResponseSchema = z.object({ shift: dutyShiftSchema });

/** POST /api/duty-rota/shifts (admin, manager). 400 with field errors: user-not-found, viewer-cannot-be-on-duty, zone-not-found. */
export function createDutyShift(input: DutyShiftInput) {
  return apiSend("POST", "/api/duty-rota/shifts", dutyShiftResponseSchema, { body: input });
}

export function useCreateDutyShift() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createDutyShift,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: getDutyRotaQueryOptions().queryKey }),
  });
}
