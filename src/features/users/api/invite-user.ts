import { useMutation, useQueryClient } from "@tanstack/react-query";
import { z } from "zod";
import { userSchema, type InviteUserInput } from "../../../../shared/schemas/auth.js";
import { apiSend } from "../../../lib/api-client";
import { getUsersQueryOptions } from "./get-users";

const inviteUserResponseSchema = z.object({ user: userSchema });

/** POST /api/users (admin): creates the account and mails a set-password link. 409 email-taken. */
export function inviteUser(input: InviteUserInput) {
  return apiSend("POST", "/api/users", inviteUserResponseSchema, { body: input });
}

export function useInviteUser() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: inviteUser,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: getUsersQueryOptions().queryKey }),
  });
}
