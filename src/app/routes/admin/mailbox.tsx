import type { QueryClient } from "@tanstack/react-query";
import { useSearchParams, type LoaderFunction } from "react-router-dom";
import { RouteError } from "../../../components/errors/route-error";
import { getMailQueryOptions } from "../../../features/mail/api/get-mail";
import { Mailbox } from "../../../features/mail/components/mailbox";
import { ALLOWED } from "../../../lib/authorization";
import { requireRole } from "../../session-guard";

export const clientLoader =
  (queryClient: QueryClient): LoaderFunction =>
  async () => {
    await requireRole(queryClient, ALLOWED.readMailbox);
    await queryClient.ensureQueryData(getMailQueryOptions());
    return null;
  };

/** `/mailbox?message=…` (admin): the mail the demo's SMTP sink caught, readable without a mail program. */
export default function MailboxRoute() {
  const [searchParams] = useSearchParams();
  const raw = searchParams.get("message");
  const selectedId = raw !== null && /^\d+$/.test(raw) ? Number(raw) : null;
  return (
    <div className="flex flex-col gap-6">
      <title>Mailbox · Benchwarden</title>
      <div>
        <h1 className="text-3xl font-bold">Mailbox</h1>
        <p className="mt-1 max-w-3xl text-lg text-muted">
          E-mail Benchwarden sent while running in demo mode, caught before it left this machine.
        </p>
      </div>
      <Mailbox selectedId={selectedId} />
    </div>
  );
}

export const ErrorBoundary = RouteError;
