import type { ReactNode } from "react";
import { isRouteErrorResponse } from "react-router-dom";
import { isApiError } from "../../lib/api-client";

/** A grower-facing title and sentence for any error a page or panel may hit. */
export function describeError(error: unknown): { title: string; detail: string } {
  // A route's own answer (thrown with react-router's data()): its text is already meant for people.
  if (isRouteErrorResponse(error)) {
    const text = typeof error.data === "string" && error.data ? error.data : null;
    if (error.status === 404) return { title: "Not found", detail: text ?? "There is no page at this address." };
    if (error.status === 403) return { title: "Not for your role", detail: text ?? "Your role may not open this page." };
    return { title: error.statusText || "Something went wrong", detail: text ?? `The page answered ${error.status}.` };
  }
  if (isApiError(error)) {
    if (error.status === 0) {
      return { title: "Can't reach Benchwarden", detail: "Check the network; this page retries on its own." };
    }
    if (error.status === 404) {
      const detail = error.message !== error.title ? error.message : "It may have been removed, or the address is wrong.";
      return { title: "Not found", detail };
    }
    if (error.status === 403) return { title: "Not for your role", detail: error.message };
    return { title: error.title, detail: `${error.message} (${error.code})` };
  }
  if (error instanceof Error) return { title: "Something went wrong", detail: error.message };
  return { title: "Something went wrong", detail: "An unexpected error happened." };
}

type ErrorMessageProps = { error: unknown; action?: ReactNode };

export function ErrorMessage({ error, action }: ErrorMessageProps) {
  const { title, detail } = describeError(error);
  return (
    <div role="alert" className="rounded-xl border-2 border-high bg-high-soft p-5 text-ink">
      <h2 className="text-xl font-bold">{title}</h2>
      <p className="mt-1 text-lg">{detail}</p>
      {action && <div className="mt-4 flex flex-wrap gap-3">{action}</div>}
    </div>
  );
}
