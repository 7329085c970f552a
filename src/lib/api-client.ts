import type { z } from "zod";
import { problemSchema, type Problem } from "../../shared/api-error.js";

/**
 * Any failed API call. `status` is the HTTP status (0 when the server could not be reached) and
 * `code` our kebab-case error code from the problem body (RFC 9457), or one of the client's own:
 * `network-error`, `http-error` (a failure without a problem body), `invalid-response`.
 */
export class ApiError extends Error {
  readonly status: number;
  readonly code: string;
  readonly title: string;
  readonly fieldErrors: NonNullable<Problem["errors"]>;

  constructor(init: { status: number; code: string; title: string; detail?: string; errors?: Problem["errors"] }) {
    super(init.detail ?? init.title);
    this.name = "ApiError";
    this.status = init.status;
    this.code = init.code;
    this.title = init.title;
    this.fieldErrors = init.errors ?? [];
  }
}

export function isApiError(error: unknown): error is ApiError {
  return error instanceof ApiError;
}

async function toApiError(response: Response): Promise<ApiError> {
  const text = await response.text().catch(() => "");
  try {
    const problem = problemSchema.safeParse(JSON.parse(text));
    if (problem.success) return new ApiError(problem.data);
  } catch {
    // Not JSON: a proxy's HTML page or an empty body; fall through to a generic error.
  }
  return new ApiError({
    status: response.status,
    code: "http-error",
    title: response.statusText || "Request failed",
    detail: `The server answered ${response.status}`,
  });
}

/** GET a JSON resource and validate it with the shared schema. Throws ApiError. */
export async function apiGet<S extends z.ZodType>(
  path: string,
  schema: S,
  options: { signal?: AbortSignal; params?: Record<string, string | undefined> } = {},
): Promise<z.output<S>> {
  const search = new URLSearchParams();
  for (const [key, value] of Object.entries(options.params ?? {})) {
    if (value !== undefined) search.set(key, value);
  }
  const url = search.size > 0 ? `${path}?${search}` : path;

  let response: Response;
  try {
    response = await fetch(url, {
      headers: { Accept: "application/json" },
      credentials: "same-origin",
      signal: options.signal,
    });
  } catch (error) {
    if (options.signal?.aborted) throw error;
    throw new ApiError({
      status: 0,
      code: "network-error",
      title: "No connection",
      detail: "The Benchwarden server could not be reached",
    });
  }

  if (!response.ok) throw await toApiError(response);

  const parsed = schema.safeParse(await response.json().catch(() => undefined));
  if (!parsed.success) {
    throw new ApiError({
      status: response.status,
      code: "invalid-response",
      title: "Unexpected answer",
      detail: `The server's answer to ${path} did not have the expected shape`,
    });
  }
  return parsed.data;
}
