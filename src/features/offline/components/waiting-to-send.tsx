import { useState } from "react";
import { Button } from "../../../components/ui/button";
import { Dialog } from "../../../components/ui/dialog";
import { Notice } from "../../../components/ui/notice";
import { formatDateTime } from "../../../lib/format-time";
import { useIsOnline, useOfflineQueue, usePersisterStatus, useWaitingEntries, type WaitingEntry } from "../hooks/offline-queue";

/** "3 waiting to send" — or, online and sending, "Sending 3…"; nothing when all is sent. */
export function waitingWords(count: number, isSending: boolean): string {
  if (isSending) return `Sending ${count}…`;
  return `${count} waiting to send`;
}

function whyWaiting(entry: WaitingEntry, isOnline: boolean): string {
  if (!isOnline) return "No connection: kept on this tablet";
  if (entry.failureStatus === 401) return "Sign in again to send it";
  if (entry.failureStatus === 0) return "The server could not be reached; trying again";
  if (entry.failureStatus !== null && entry.failureStatus >= 500) return "The server had a problem; trying again";
  if (entry.isPaused) return "Queued behind the one before it";
  return "Sending";
}

/**
 * A pill in the bottom corner for work not yet on the server: observations and check-offs entered while
 * the network was down. Tapping it lists them and what was refused. Renders nothing when all is
 * sent and the connection is up.
 */
export function WaitingToSend() {
  const entries = useWaitingEntries();
  const isOnline = useIsOnline();
  const { notSent, isStorageFailing } = usePersisterStatus();
  const [isOpen, setIsOpen] = useState(false);
  const count = entries.length;
  if (count === 0 && notSent.length === 0 && isOnline) return null;

  // Online and nothing has failed yet: it is on its way. After a failed try it waits again.
  const isSending = isOnline && count > 0 && entries.every((e) => e.failureCount === 0);
  const tone = !isOnline || notSent.length > 0 || isStorageFailing ? "border-high bg-high-soft" : "border-accent bg-surface";

  return (
    <>
      <button
        type="button"
        onClick={() => setIsOpen(true)}
        data-testid="waiting-to-send"
        aria-live="polite"
        className={`fixed bottom-4 left-4 z-30 inline-flex min-h-touch items-center gap-2 whitespace-nowrap rounded-full border-2 px-4 text-lg font-bold text-ink shadow-lg ${tone}`}
      >
        {!isOnline && <span>Offline</span>}
        {!isOnline && count > 0 && <span aria-hidden="true">·</span>}
        {count > 0 && <span>{waitingWords(count, isSending)}</span>}
        {notSent.length > 0 && <span>{notSent.length} not sent</span>}
      </button>
      {isOpen && <WaitingDialog entries={entries} isOnline={isOnline} onClose={() => setIsOpen(false)} />}
    </>
  );
}

function WaitingDialog({ entries, isOnline, onClose }: { entries: WaitingEntry[]; isOnline: boolean; onClose: () => void }) {
  const { sendNow, discard } = useOfflineQueue();
  const { notSent, isStorageFailing } = usePersisterStatus();
  return (
    <Dialog
      title={entries.length > 0 ? `${entries.length} waiting to send` : "Not sent"}
      onClose={onClose}
      actions={
        <>
          {isOnline && entries.length > 0 && (
            <Button
              onClick={() => {
                sendNow();
              }}
            >
              Send now
            </Button>
          )}
          <Button variant="primary" onClick={onClose}>
            Close
          </Button>
        </>
      }
    >
      {isStorageFailing && (
        <Notice tone="warning" className="mb-3">
          This tablet refused to store them (its storage may be full). Keep this page open until they are sent.
        </Notice>
      )}
      {entries.length > 0 && (
        <>
          <p>They are kept on this tablet and sent by themselves, in order, once the connection is back. A reload does not lose them.</p>
          <ul className="mt-3 flex flex-col gap-2">
            {entries.map((entry, i) => (
              <li key={`${entry.submittedAtMs}-${i}`} className="rounded-lg border-2 border-line p-3">
                <p className="font-semibold">{entry.label}</p>
                {entry.detail && <p className="text-base">{entry.detail}</p>}
                <p className="text-base text-muted">
                  Entered {formatDateTime(entry.submittedAtMs)} · {whyWaiting(entry, isOnline)}
                </p>
              </li>
            ))}
          </ul>
        </>
      )}
      {notSent.length > 0 && (
        <section className="mt-4" aria-labelledby="not-sent-heading">
          <h3 id="not-sent-heading" className="text-xl font-bold">
            Refused by the server
          </h3>
          <p className="text-base text-muted">Read what it was, enter it again if it still matters, then dismiss it.</p>
          <ul className="mt-2 flex flex-col gap-2">
            {notSent.map((entry) => (
              <li key={entry.id} className="rounded-lg border-2 border-high p-3">
                <p className="font-semibold">{entry.label}</p>
                {entry.detail && <p className="text-base">{entry.detail}</p>}
                <p className="text-base font-semibold text-high">{entry.reason}</p>
                <p className="text-base text-muted">Entered {formatDateTime(entry.atMs)}</p>
                <Button className="mt-2" onClick={() => discard(entry)}>
                  Dismiss
                </Button>
              </li>
            ))}
          </ul>
        </section>
      )}
    </Dialog>
  );
}
