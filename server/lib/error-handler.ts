import type { ErrorRequestHandler, RequestHandler } from "express";
import { ZodError } from "zod";
import { PROBLEM_CONTENT_TYPE, type Problem } from "../../shared/api-error.js";
import { AppError } from "./errors.js";
import type { Logger } from "./logger.js";

const TITLES: Record<number, string> = {
  400: "Bad request",
  401: "Sign-in required",
  403: "Not allowed",
  404: "Not found",
  409: "Conflict",
  413: "Too large",
  415: "Unsupported media type",
  429: "Too many requests",
  500: "Internal error",
};

export function sendProblem(res: Parameters<RequestHandler>[1], problem: Omit<Problem, "type" | "title"> & { title?: string }): void {
  const body: Problem = {
    type: "about:blank",
    title: problem.title ?? TITLES[problem.status] ?? "Error",
    ...problem,
  };
  res.status(problem.status).type(PROBLEM_CONTENT_TYPE).send(JSON.stringify(body));
}

/** Unknown /api paths answer with problem details, not the app's HTML. */
export const apiNotFound: RequestHandler = (req, res) => {
  sendProblem(res, { status: 404, code: "route-not-found", detail: `No API route ${req.method} ${req.path}` });
};

/** The single error middleware: AppError, ZodError, body-parser errors, anything else. */
export function createErrorHandler(logger: Logger): ErrorRequestHandler {
  return (err, req, res, next) => {
    if (res.headersSent) return next(err);
    if (err instanceof AppError) {
      return sendProblem(res, { status: err.status, code: err.code, detail: err.message, errors: err.fieldErrors });
    }
    if (err instanceof ZodError) {
      return sendProblem(res, {
        status: 400,
        code: "invalid-input",
        detail: "Some fields are not valid",
        errors: err.issues.map((i) => ({ path: i.path.join("."), message: i.message })),
      });
    }
    // body-parser errors carry an HTTP status and a type (entity.parse.failed, entity.too.large, …).
    const status = typeof err?.status === "number" && err.status >= 400 && err.status < 500 ? err.status : 500;
    if (status < 500) {
      const code = typeof err.type === "string" ? err.type.replaceAll(".", "-") : "bad-request";
      return sendProblem(res, { status, code, detail: String(err.message ?? "Bad request") });
    }
    logger.error({ err, method: req.method, path: req.path }, "unhandled error");
    sendProblem(res, { status: 500, code: "internal-error", detail: "Something went wrong on the server; it has been logged" });
  };
}
