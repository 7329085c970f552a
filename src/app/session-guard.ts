import { useQueryClient, type QueryClient } from "@tanstack/react-query";
import { useEffect, useRef } from "react";
import { data, redirect, useLocation, useNavigate, type LoaderFunction, type LoaderFunctionArgs } from "react-router-dom";
import type { Role, SessionResponse } from "../../shared/schemas/auth.js";
import { ROLE_LABELS } from "../../shared/schemas/auth.js";
import { getSessionQueryOptions } from "../features/auth/api/get-session";
import { paths } from "../config/paths";
import { isSignInRequired } from "../lib/api-client";

function signInPathFor(where: { pathname: string; search: string }): string {
  return paths.signIn.to({ next: where.pathname + where.search });
}

/**
 * Wraps a signed-in page's loader: a 401 from anything it loads (the session ended, the user
 * was disabled) becomes a redirect to the sign-in page, which sends them back here afterwards.
 */
export function withSignInRedirect(loader: LoaderFunction): LoaderFunction {
  return async (args: LoaderFunctionArgs) => {
    try {
      return await loader(args);
    } catch (error) {
      if (isSignInRequired(error)) throw redirect(signInPathFor(new URL(args.request.url)));
      throw error;
    }
  };
}

/** The signed-in layout's loader: restores the session from the cookie (GET /api/session). */
export const sessionLoader =
  (queryClient: QueryClient): LoaderFunction =>
  async () => {
    await queryClient.ensureQueryData(getSessionQueryOptions());
    return null;
  };

/**
 * For a page only some roles may open: a 403 the route's ErrorBoundary explains, before any of
 * the page's data is asked for (the server would refuse it anyway).
 */
export async function requireRole(queryClient: QueryClient, roles: readonly Role[]): Promise<SessionResponse> {
  const session = await queryClient.ensureQueryData(getSessionQueryOptions());
  if (!roles.includes(session.user.role)) {
    const who = roles.map((r) => ROLE_LABELS[r].toLowerCase()).join(" or ");
    throw data(`This page is for the ${who} role. You are signed in as ${ROLE_LABELS[session.user.role].toLowerCase()}.`, {
      status: 403,
      statusText: "Not for your role",
    });
  }
  return session;
}

/**
 * While signed in: a query shown on the page or a mutation answered 401 (session over, account
 * disabled) sends the user to sign-in, with the page they were on as `next`. Queries nobody
 * shows yet are a loader's, during a page change: `withSignInRedirect` handles those, with the
 * page they were going to.
 */
export function useSignInRedirect() {
  const queryClient = useQueryClient();
  const navigate = useNavigate();
  const location = useLocation();
  const locationRef = useRef(location);
  useEffect(() => {
    locationRef.current = location;
  });

  useEffect(() => {
    let isRedirecting = false;
    const onError = (error: unknown) => {
      if (isRedirecting || !isSignInRequired(error)) return;
      isRedirecting = true;
      void navigate(signInPathFor(locationRef.current), { replace: true });
    };
    const stopQueries = queryClient.getQueryCache().subscribe((event) => {
      if (event.type === "updated" && event.action.type === "error" && event.query.getObserversCount() > 0) onError(event.action.error);
    });
    const stopMutations = queryClient.getMutationCache().subscribe((event) => {
      if (event.type === "updated" && event.action.type === "error") onError(event.action.error);
    });
    return () => {
      stopQueries();
      stopMutations();
    };
  }, [queryClient, navigate]);
}

/** setTimeout's longest delay (about 24.8 days); longer sessions are checked by the periodic refetch. */
const MAX_TIMER_MS = 2_147_483_647;

/** When the session's time is up, ask the server again; its 401 then leads to sign-in. */
export function useSessionExpiry(expiresAtMs: number) {
  const queryClient = useQueryClient();
  useEffect(() => {
    const waitMs = expiresAtMs - Date.now() + 1_000;
    if (waitMs > MAX_TIMER_MS) return;
    const timer = window.setTimeout(
      () => void queryClient.invalidateQueries({ queryKey: getSessionQueryOptions().queryKey }),
      Math.max(0, waitMs),
    );
    return () => window.clearTimeout(timer);
  }, [queryClient, expiresAtMs]);
}
