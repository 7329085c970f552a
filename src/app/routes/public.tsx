import { isRouteErrorResponse, useRouteError } from "react-router-dom";
import { ErrorMessage } from "../../components/errors/error-message";
import { AuthLayout } from "../../components/layouts/auth-layout";
import { LinkButton } from "../../components/ui/link-button";
import { Loading } from "../../components/ui/loading";
import { paths } from "../../config/paths";

/** While a page used before signing in loads its code. */
export function PublicFallback() {
  return (
    <AuthLayout title="Benchwarden">
      <Loading />
    </AuthLayout>
  );
}

export function PublicRouteError() {
  const error = useRouteError();
  return (
    <AuthLayout title="Something went wrong">
      <ErrorMessage
        error={isRouteErrorResponse(error) ? new Error(`${error.status} ${error.statusText}`) : error}
        action={<LinkButton to={paths.signIn.to()}>Go to sign-in</LinkButton>}
      />
    </AuthLayout>
  );
}
