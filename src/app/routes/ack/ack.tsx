import type { QueryClient } from "@tanstack/react-query";
import { useSearchParams, type LoaderFunction } from "react-router-dom";
import { AuthLayout } from "../../../components/layouts/auth-layout";
import { getAckLinkQueryOptions } from "../../../features/alerts/api/get-ack-link";
import { AckLinkNotValid, AckPanel } from "../../../features/alerts/components/ack-panel";
import { PublicRouteError } from "../public";

export const clientLoader =
  (queryClient: QueryClient): LoaderFunction =>
  async ({ request }) => {
    const token = new URL(request.url).searchParams.get("token");
    // prefetch, not ensure: an expired link is an answer the page explains, not a route error.
    // Only a GET: opening the page acknowledges nothing (mail scanners follow links too).
    if (token) await queryClient.prefetchQuery(getAckLinkQueryOptions(token));
    return null;
  };

/** `/ack?token=…`: where an alert e-mail's "I've got it" link leads; works signed out, on a phone. */
export default function AckRoute() {
  const [searchParams] = useSearchParams();
  const token = searchParams.get("token");
  return (
    <AuthLayout title="Bench alert">
      <title>Acknowledge · Benchwarden</title>
      {token ? <AckPanel token={token} /> : <AckLinkNotValid reason="missing" />}
    </AuthLayout>
  );
}

export const ErrorBoundary = PublicRouteError;
