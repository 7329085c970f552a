/** The one error class services throw; the error middleware turns it into problem details. */
export class AppError extends Error {
  constructor(
    readonly code: string,
    message: string,
    readonly status = 500,
    readonly fieldErrors?: { path: string; message: string }[],
  ) {
    super(message);
    this.name = "AppError";
  }
}

export const notFound = (code: string, message: string) => new AppError(code, message, 404);
export const badRequest = (code: string, message: string) => new AppError(code, message, 400);
