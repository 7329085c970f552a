import { problemSchema } from "../../../../shared/api-error.js";
import { PHOTO_LIMITS, uploadPhotosResponseSchema, type UploadPhotosResponse } from "../../../../shared/schemas/batches.js";
import { ApiError } from "../../../lib/api-client";

export type PhotoFile = { blob: Blob; name: string };

/**
 * POST /api/observations/:id/photos (admin, manager, grower): multipart/form-data, the images in
 * field `photos` (at most PHOTO_LIMITS.maxPerUpload). The server judges them by content (415
 * not-an-image / image-unreadable, 413 photo-too-large) and stores an image sent twice once, so
 * a retry after a dropped connection is harmless. Throws ApiError like the JSON client does.
 */
export async function uploadPhotos({ observationId, files, signal }: { observationId: number; files: readonly PhotoFile[]; signal?: AbortSignal }): Promise<UploadPhotosResponse> {
  const form = new FormData();
  for (const file of files) form.append(PHOTO_LIMITS.field, file.blob, file.name);
  let response: Response;
  try {
    // No Content-Type header: the browser writes the multipart boundary itself.
    response = await fetch(`/api/observations/${encodeURIComponent(observationId)}/photos`, {
      method: "POST",
      body: form,
      headers: { Accept: "application/json" },
      credentials: "same-origin",
      signal,
    });
  } catch (error) {
    if (signal?.aborted) throw error;
    throw new ApiError({ status: 0, code: "network-error", title: "No connection", detail: "The Benchwarden server could not be reached" });
  }
  const body: unknown = await response.json().catch(() => undefined);
  if (!response.ok) {
    const problem = problemSchema.safeParse(body);
    if (problem.success) throw new ApiError(problem.data);
    throw new ApiError({ status: response.status, code: "http-error", title: response.statusText || "Upload failed", detail: `The server answered ${response.status}` });
  }
  const parsed = uploadPhotosResponseSchema.safeParse(body);
  if (!parsed.success) {
    throw new ApiError({ status: response.status, code: "invalid-response", title: "Unexpected answer", detail: "The server's answer to the photo upload did not have the expected shape" });
  }
  return parsed.data;
}
