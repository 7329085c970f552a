import { useMutation, useQueryClient } from "@tanstack/react-query";
import { siteResponseSchema, type CreateSiteInput } from "../../../../shared/schemas/layout.js";
import { apiSend } from "../../../lib/api-client";
import { invalidateAfterLayoutChange } from "./invalidate-after-layout-change";

/** POST /api/sites (admin). 409 site-name-taken is on the name field. */
export function createSite(input: CreateSiteInput) {
  return apiSend("POST", "/api/sites", siteResponseSchema, { body: input });
}

export function useCreateSite() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: createSite, onSuccess: () => invalidateAfterLayoutChange(queryClient) });
}
