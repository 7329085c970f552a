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

function buildUrl(path: string, params: Record<string, string | undefined> = {}): string {
  const search = new URLSearchParams();
  for (const [key, value] of Object.entries(params)) {
    if (value !== undefined) search.set(key, value);
  }
  return search.size > 0 ? `${path}?${search}` : path;
}

async function send(url: string, init: RequestInit, signal: AbortSignal | undefined): Promise<Response> {
  let response: Response;
  try {
    // The session is an httpOnly, SameSite=Strict cookie: same-origin requests carry it.
    response = await fetch(url, { ...init, credentials: "same-origin", signal });
  } catch (error) {
    if (signal?.aborted) throw error;
    throw new ApiError({
      status: 0,
      code: "network-error",
      title: "No connection",
      detail: "The Benchwarden server could not be reached",
    });
  }
  if (!response.ok) throw await toApiError(response);
  return response;
}

async function parseBody<S extends z.ZodType>(response: Response, schema: S, path: string): Promise<z.output<S>> {
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

/** GET a JSON resource and validate it with the shared schema. Throws ApiError. */
export async function apiGet<S extends z.ZodType>(
  path: string,
  schema: S,
  options: { signal?: AbortSignal; params?: Record<string, string | undefined> } = {},
): Promise<z.output<S>> {
  const response = await send(buildUrl(path, options.params), { headers: { Accept: "application/json" } }, options.signal);
  return parseBody(response, schema, path);
}

type SendOptions = { body?: unknown; signal?: AbortSignal };

/**
 * POST/PUT/PATCH/DELETE with a JSON body. With a schema the answer is validated and returned; without
 * one (204, 202) the body is ignored. Throws ApiError.
 */
export async function apiSend<S extends z.ZodType>(method: "POST" | "PUT" | "PATCH" | "DELETE", path: string, schema: S, options?: SendOptions): Promise<z.output<S>>;
export async function apiSend(method: "POST" | "PUT" | "PATCH" | "DELETE", path: string, schema?: undefined, options?: SendOptions): Promise<void>;
export async function apiSend<S extends z.ZodType>(
  method: "POST" | "PUT" | "PATCH" | "DELETE",
  path: string,
  schema?: S,
  { body, signal }: SendOptions = {},
): Promise<z.output<S> | void> {
  const headers: Record<string, string> = { Accept: "application/json" };
  if (body !== undefined) headers["Content-Type"] = "application/json";
  const response = await send(path, { method, headers, body: body === undefined ? undefined : JSON.stringify(body) }, signal);
  if (!schema) return;
  return parseBody(response, schema, path);
}

/**
 * True when the server says the session is gone (expired, signed out elsewhere, user disabled):
 * any 401 except a wrong e-mail/password on the sign-in form itself.
 */
export function isSignInRequired(error: unknown): boolean {
  return isApiError(error) && error.status === 401 && error.code !== "invalid-credentials";
}
