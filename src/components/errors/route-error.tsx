import { isRouteErrorResponse, useRevalidator, useRouteError } from "react-router-dom";
import { isApiError } from "../../lib/api-client";
import { paths } from "../../config/paths";
import { LinkButton } from "../ui/link-button";
import { ErrorMessage } from "./error-message";

/** The ErrorBoundary of a route: says what failed and offers a retry and the way home. */
export function RouteError() {
  const error = useRouteError();
  const revalidator = useRevalidator();
  // Asking again will not change the role: no retry for a 403.
  const isForbidden = (isRouteErrorResponse(error) || isApiError(error)) && error.status === 403;
  return (
    <div className="mx-auto max-w-2xl py-8">
      <ErrorMessage
        error={error}
        action={
          <>
            {!isForbidden && (
              <button
                type="button"
                onClick={() => void revalidator.revalidate()}
                className="min-h-touch rounded-lg border-2 border-ink bg-ink px-4 text-lg font-semibold text-page"
              >
                Try again
              </button>
            )}
            <LinkButton to={paths.dashboard.to()}>All benches</LinkButton>
          </>
        }
      />
    </div>
  );
}
