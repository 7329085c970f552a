import { useMutation, useQueryClient } from "@tanstack/react-query";
import { z } from "zod";
import { userSchema, type SessionResponse, type UpdateMeInput } from "../../../../shared/schemas/auth.js";
import { apiSend } from "../../../lib/api-client";
import { getSessionQueryOptions } from "./get-session";

const updateMeResponseSchema = z.object({ user: userSchema });

/** PATCH /api/me: the signed-in user's own name or temperature unit. */
export function updateMe(input: UpdateMeInput) {
  return apiSend("PATCH", "/api/me", updateMeResponseSchema, { body: input });
}

/** Applies the change to the cached session at once and puts it back if the server refuses. */
export function useUpdateMe() {
  const queryClient = useQueryClient();
  const queryKey = getSessionQueryOptions().queryKey;
  return useMutation({
    mutationFn: updateMe,
    onMutate: async (input) => {
      await queryClient.cancelQueries({ queryKey });
      const previous = queryClient.getQueryData(queryKey);
      if (previous) {
        const user = {
          ...previous.user,
          ...(input.name !== undefined && { name: input.name }),
          ...(input.temperatureUnit !== undefined && { temperatureUnit: input.temperatureUnit }),
        };
        queryClient.setQueryData(queryKey, { ...previous, user });
      }
      return { previous };
    },
    onError: (_error, _input, context) => {
      if (context?.previous) queryClient.setQueryData(queryKey, context.previous);
    },
    onSuccess: ({ user }) => {
      queryClient.setQueryData(queryKey, (current: SessionResponse | undefined) => (current ? { ...current, user } : current));
    },
  });
}
