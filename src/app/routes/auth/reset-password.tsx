import { AuthLayout } from "../../../components/layouts/auth-layout";
import { RequestResetForm } from "../../../features/auth/components/request-reset-form";
import { PublicRouteError } from "../public";

/** `/reset-password`: ask for a link to choose a new password. */
export default function RequestPasswordResetRoute() {
  return (
    <AuthLayout title="Forgot your password?">
      <title>Reset password · Benchwarden</title>
      <RequestResetForm />
    </AuthLayout>
  );
}

export const ErrorBoundary = PublicRouteError;
