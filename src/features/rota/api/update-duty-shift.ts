import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { DutyShiftInput } from "../../../../shared/schemas/alerts.js";
import { apiSend } from "../../../lib/api-client";
import { dutyShiftResponseSchema } from "./create-duty-shift";
import { getDutyRotaQueryOptions } from "./get-duty-rota";

/** PUT /api/duty-rota/shifts/:id (admin, manager): the whole shift replaced. 404 shift-not-found. */
export function updateDutyShift({ shiftId, input }: { shiftId: number; input: DutyShiftInput }) {
  return apiSend("PUT", `/api/duty-rota/shifts/${encodeURIComponent(shiftId)}`, dutyShiftResponseSchema, { body: input });
}

export function useUpdateDutyShift() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateDutyShift,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: getDutyRotaQueryOptions().queryKey }),
  });
}
