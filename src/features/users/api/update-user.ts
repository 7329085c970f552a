import { useMutation, useQueryClient } from "@tanstack/react-query";
import { z } from "zod";
import { userSchema, type UpdateUserInput } from "../../../../shared/schemas/auth.js";
import { apiSend } from "../../../lib/api-client";
import { getUsersQueryOptions } from "./get-users";

const updateUserResponseSchema = z.object({ user: userSchema });

/** PATCH /api/users/:id (admin): name, role, disabled. 409 last-admin, cannot-disable-self. */
export function updateUser({ id, input }: { id: number; input: UpdateUserInput }) {
  return apiSend("PATCH", `/api/users/${encodeURIComponent(id)}`, updateUserResponseSchema, { body: input });
}

export function useUpdateUser() {
  const queryClient = useQueryClient();
  const queryKey = getUsersQueryOptions().queryKey;
  return useMutation({
    mutationFn: updateUser,
    onSuccess: ({ user }) => {
      queryClient.setQueryData(queryKey, (current) =>
        current ? { users: current.users.map((u) => (u.id === user.id ? user : u)) } : current,
      );
      return queryClient.invalidateQueries({ queryKey });
    },
  });
}
