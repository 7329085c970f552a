import { useQueryClient, type QueryClient } from "@tanstack/react-query";
import { useLoaderData, useNavigate, useRevalidator, useSearchParams, type LoaderFunction } from "react-router-dom";
import type { User } from "../../../../shared/schemas/auth.js";
import { AuthLayout } from "../../../components/layouts/auth-layout";
import { Button } from "../../../components/ui/button";
import { LinkButton } from "../../../components/ui/link-button";
import { Notice } from "../../../components/ui/notice";
import { useToast } from "../../../components/ui/toast";
import { safeNextPath } from "../../../config/paths";
import { getSession, getSessionQueryOptions } from "../../../features/auth/api/get-session";
import { useDeleteSession } from "../../../features/auth/api/delete-session";
import { SignInForm } from "../../../features/auth/components/sign-in-form";
import { PublicRouteError } from "../public";

type SignInLoaderData = { signedInAs: User | null };

export const clientLoader =
  (queryClient: QueryClient): LoaderFunction =>
  async (): Promise<SignInLoaderData> => {
    // Always ask the server: a cached session may be the one that just ran out. Asked outside
    // the cache, so the 401 that is normal here reaches no one watching the session query.
    try {
      const session = await getSession();
      queryClient.setQueryData(getSessionQueryOptions().queryKey, session);
      return { signedInAs: session.user };
    } catch {
      return { signedInAs: null };
    }
  };

/** `/sign-in?next=…&email=…` */
export default function SignInRoute() {
  const { signedInAs } = useLoaderData() as SignInLoaderData;
  const [searchParams] = useSearchParams();
  const navigate = useNavigate();
  const next = safeNextPath(searchParams.get("next"));
  const hasNext = searchParams.has("next");

  return (
    <AuthLayout title="Sign in">
      <title>Sign in · Benchwarden</title>
      {signedInAs ? (
        <AlreadySignedIn user={signedInAs} next={next} />
      ) : (
        <SignInForm
          defaultEmail={searchParams.get("email") ?? ""}
          notice={hasNext ? "Sign in to continue. Your session has ended, or you have not signed in on this device yet." : undefined}
          onSignedIn={() => void navigate(next, { replace: true })}
        />
      )}
    </AuthLayout>
  );
}

/** Opened while signed in (e.g. from a set-password link): go on, or sign out to use another account. */
function AlreadySignedIn({ user, next }: { user: User; next: string }) {
  const queryClient = useQueryClient();
  const revalidator = useRevalidator();
  const { showToast } = useToast();
  const signOut = useDeleteSession();
  return (
    <div className="flex flex-col gap-4">
      <Notice tone="info">
        You are signed in as <strong>{user.name}</strong> ({user.email}).
      </Notice>
      <LinkButton to={next} variant="primary">
        Go on as {user.name}
      </LinkButton>
      <Button
        isBusy={signOut.isPending}
        onClick={() =>
          signOut.mutate(undefined, {
            onSuccess: () => {
              queryClient.removeQueries();
              void revalidator.revalidate();
            },
            onError: (error) => showToast(`Not signed out: ${error.message}`, "error"),
          })
        }
      >
        Sign out to use another account
      </Button>
    </div>
  );
}

export const ErrorBoundary = PublicRouteError;
