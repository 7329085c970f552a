import { useQueryClient, type QueryClient } from "@tanstack/react-query";
import { Link, type LoaderFunction } from "react-router-dom";
import { PanelBoundary } from "../../../components/errors/panel-boundary";
import { RouteError } from "../../../components/errors/route-error";
import { buttonClasses } from "../../../components/ui/button";
import { LinkButton } from "../../../components/ui/link-button";
import { Notice } from "../../../components/ui/notice";
import { paths } from "../../../config/paths";
import { getSessionQueryOptions, useSession } from "../../../features/auth/api/get-session";
import { getUsersQueryOptions } from "../../../features/users/api/get-users";
import { InviteUserForm } from "../../../features/users/components/invite-user-form";
import { UsersTable } from "../../../features/users/components/users-table";
import { ALLOWED, Authorized } from "../../../lib/authorization";
import { requireRole } from "../../session-guard";

export const clientLoader =
  (queryClient: QueryClient): LoaderFunction =>
  async () => {
    await requireRole(queryClient, ALLOWED.manageUsers);
    await queryClient.ensureQueryData(getUsersQueryOptions());
    return null;
  };

/** `/users` (admin): accounts, roles, disabling, invitations. */
export default function UsersRoute() {
  const queryClient = useQueryClient();
  // The loader checked the role; this catches an admin who has just given up the role here.
  return (
    <Authorized
      roles={ALLOWED.manageUsers}
      fallback={
        <Notice tone="info" title="You are no longer an admin" className="mx-auto max-w-2xl">
          <p>This page is for admins.</p>
          <LinkButton to={paths.dashboard.to()} className="mt-3">
            All benches
          </LinkButton>
        </Notice>
      }
    >
      <UsersPage onChangedSelf={() => void queryClient.invalidateQueries({ queryKey: getSessionQueryOptions().queryKey })} />
    </Authorized>
  );
}

function UsersPage({ onChangedSelf }: { onChangedSelf: () => void }) {
  // The mailbox holds the invitation only in demo mode (the local sink); a real relay delivers it.
  const { data: session } = useSession();
  return (
    <div className="flex flex-col gap-10">
      <title>Users · Benchwarden</title>
      <div>
        <h1 className="text-3xl font-bold">Users</h1>
        <p className="mt-1 max-w-3xl text-lg text-muted">
          Who may sign in, and what each may do. A change of role takes effect on that person's next action.
        </p>
      </div>
      <section aria-labelledby="users-list-heading">
        <div className="mb-3 flex flex-wrap items-center justify-between gap-3">
          <h2 id="users-list-heading" className="text-2xl font-bold">
            Accounts
          </h2>
          <a href="#users-invite" className={buttonClasses("secondary")}>
            Invite someone <span aria-hidden="true">↓</span>
          </a>
        </div>
        <PanelBoundary>
          <UsersTable onChangedSelf={onChangedSelf} />
        </PanelBoundary>
      </section>
      <section id="users-invite" aria-labelledby="users-invite-heading" className="scroll-mt-32 rounded-2xl border-2 border-line bg-surface p-4 sm:p-6">
        <h2 id="users-invite-heading" className="mb-1 text-2xl font-bold">
          Invite someone
        </h2>
        <p className="mb-4 text-lg text-muted">They get an e-mail with a link to choose their password.</p>
        <InviteUserForm
          afterInvite={
            session.demo ? (
              <>
                This is the demo: the e-mail is in the{" "}
                <Link to={paths.mailbox.to()} className="font-semibold text-accent underline underline-offset-4">
                  Mailbox
                </Link>
                .
              </>
            ) : undefined
          }
        />
      </section>
    </div>
  );
}

export const ErrorBoundary = RouteError;
