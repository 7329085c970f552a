import { useMutation, useQueryClient } from "@tanstack/react-query";
import { apiSend } from "../../../lib/api-client";
import { getDutyRotaQueryOptions } from "./get-duty-rota";

/** DELETE /api/duty-rota/shifts/:id (admin, manager): 204. */
export function deleteDutyShift(shiftId: number) {
  return apiSend("DELETE", `/api/duty-rota/shifts/${encodeURIComponent(shiftId)}`);
}

export function useDeleteDutyShift() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: deleteDutyShift,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: getDutyRotaQueryOptions().queryKey }),
  });
}
