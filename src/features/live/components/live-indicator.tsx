import type { StreamState } from "../hooks/use-readings-stream";

const LABELS: Record<StreamState, string> = {
  connecting: "Connecting…",
  live: "Live",
  reconnecting: "Reconnecting…",
};

/** A small badge saying whether the dashboard is receiving readings as they happen. */
export function LiveIndicator({ state }: { state: StreamState }) {
  const isLive = state === "live";
  return (
    <span
      role="status"
      data-state={state}
      title={isLive ? "New readings appear as they arrive" : "Updates are paused; values refresh every minute meanwhile"}
      className={`inline-flex items-center gap-2 rounded-full border-2 px-3 py-1 text-base font-semibold ${
        isLive ? "border-ok/40 text-ok" : "border-line text-muted"
      }`}
    >
      <span
        aria-hidden="true"
        className={`size-2.5 rounded-full ${isLive ? "bg-ok" : "border-2 border-current bg-transparent motion-safe:animate-pulse"}`}
      />
      {LABELS[state]}
    </span>
  );
}
