import type { QueryClient } from "@tanstack/react-query";
import { useSearchParams, type LoaderFunction } from "react-router-dom";
import { AuthLayout } from "../../../components/layouts/auth-layout";
import { getPasswordLinkQueryOptions } from "../../../features/auth/api/get-password-link";
import { LinkNotValid, SetPasswordPanel } from "../../../features/auth/components/set-password-panel";
import { PublicRouteError } from "../public";

export const clientLoader =
  (queryClient: QueryClient): LoaderFunction =>
  async ({ request }) => {
    const token = new URL(request.url).searchParams.get("token");
    // prefetch, not ensure: an expired link is an answer the page explains, not a route error.
    if (token) await queryClient.prefetchQuery(getPasswordLinkQueryOptions(token));
    return null;
  };

/** `/set-password?token=…`: where invite and reset e-mails lead. Opening it changes nothing. */
export default function SetPasswordRoute() {
  const [searchParams] = useSearchParams();
  const token = searchParams.get("token");
  return (
    <AuthLayout title="Set your password">
      <title>Set password · Benchwarden</title>
      {token ? <SetPasswordPanel token={token} /> : <LinkNotValid reason="missing" />}
    </AuthLayout>
  );
}

export const ErrorBoundary = PublicRouteError;
