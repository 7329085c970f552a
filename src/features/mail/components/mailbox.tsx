import { useQueryClient } from "@tanstack/react-query";
import { Link } from "react-router-dom";
import type { CaughtMail } from "../../../../shared/schemas/mail.js";
import { Button } from "../../../components/ui/button";
import { LinkButton } from "../../../components/ui/link-button";
import { paths } from "../../../config/paths";
import { useNow } from "../../../hooks/use-now";
import { formatAge, formatDateTime } from "../../../lib/format-time";
import { getMailQueryOptions, useMail } from "../api/get-mail";
import { splitLinks } from "../utils/split-links";

/**
 * The mail the local SMTP sink caught (demo mode): a list, and the chosen message beside it on a
 * tablet or desktop, or instead of it on a phone.
 */
export function Mailbox({ selectedId }: { selectedId: number | null }) {
  const { data, isFetching } = useMail();
  const queryClient = useQueryClient();
  const nowMs = useNow(30_000);
  const selected = data.messages.find((m) => m.id === selectedId) ?? null;

  const refresh = (
    <Button isBusy={isFetching} onClick={() => void queryClient.invalidateQueries({ queryKey: getMailQueryOptions().queryKey })}>
      Check for new mail
    </Button>
  );

  if (data.messages.length === 0) {
    return (
      <div className="flex flex-col items-start gap-4">
        <p className="max-w-2xl text-lg">
          No mail yet. In demo mode every e-mail Benchwarden sends (invitations, password links, alerts) lands here instead of
          going out. With a real mail relay set up (SMTP_URL) this page stays empty.
        </p>
        {refresh}
      </div>
    );
  }

  return (
    <div className="grid gap-6 md:grid-cols-[minmax(0,2fr)_minmax(0,3fr)]">
      <section aria-labelledby="mail-list-heading" className={selected ? "max-md:hidden" : ""}>
        <div className="mb-3 flex flex-wrap items-center justify-between gap-2">
          <h2 id="mail-list-heading" className="text-2xl font-bold">
            {data.messages.length === 1 ? "1 message" : `${data.messages.length} messages`}
          </h2>
          {refresh}
        </div>
        <ul className="flex flex-col gap-2">
          {data.messages.map((message) => (
            <li key={message.id}>
              <Link
                to={paths.mailbox.to(message.id)}
                aria-current={message.id === selectedId ? "true" : undefined}
                className="block min-h-touch rounded-xl border-2 border-line bg-surface p-3 hover:border-accent aria-[current=true]:border-ink"
              >
                <span className="block text-lg font-semibold">{message.subject || "(no subject)"}</span>
                <span className="block break-all text-base text-muted">To {message.to.join(", ")}</span>
                <span className="block text-base text-muted" title={formatDateTime(message.receivedAtMs)}>
                  {formatAge(message.receivedAtMs, nowMs)}
                </span>
              </Link>
            </li>
          ))}
        </ul>
      </section>
      <div className={selected ? "" : "max-md:hidden"}>
        {selected ? (
          <MailMessage message={selected} />
        ) : (
          <p className="rounded-xl border-2 border-dashed border-line p-6 text-lg text-muted">Choose a message to read it.</p>
        )}
      </div>
    </div>
  );
}

function MailMessage({ message }: { message: CaughtMail }) {
  return (
    <article aria-labelledby="mail-subject" className="rounded-2xl border-2 border-line bg-surface p-4 sm:p-6">
      <LinkButton to={paths.mailbox.to()} className="mb-4 md:hidden">
        <span aria-hidden="true">←</span> All mail
      </LinkButton>
      <h2 id="mail-subject" className="text-2xl font-bold">
        {message.subject || "(no subject)"}
      </h2>
      <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-3 text-base">
        <dt className="font-semibold">From</dt>
        <dd className="break-all">{message.from}</dd>
        <dt className="font-semibold">To</dt>
        <dd className="break-all">{message.to.join(", ")}</dd>
        <dt className="font-semibold">Received</dt>
        <dd>{formatDateTime(message.receivedAtMs)}</dd>
      </dl>
      <div className="mt-4 whitespace-pre-wrap break-words border-t-2 border-line pt-4 text-lg">
        {splitLinks(message.text).map((part, i) =>
          part.kind === "link" ? (
            <a key={i} href={part.href} className="break-all font-semibold text-accent underline underline-offset-4">
              {part.href}
            </a>
          ) : (
            <span key={i}>{part.text}</span>
          ),
        )}
      </div>
    </article>
  );
}
