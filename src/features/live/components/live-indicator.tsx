import { useSyncExternalStore } from "react";
import type { StreamState } from "../hooks/use-readings-stream";

const LABELS: Record<StreamState | "offline", string> = {
  connecting: "Connecting…",
  live: "Live",
  reconnecting: "Reconnecting…",
  offline: "Offline",
};

function subscribeOnline(onChange: () => void): () => void {
  window.addEventListener("online", onChange);
  window.addEventListener("offline", onChange);
  return () => {
    window.removeEventListener("online", onChange);
    window.removeEventListener("offline", onChange);
  };
}

/**
 * A small badge saying whether the dashboard is receiving readings as they happen. The browser's
 * own offline state wins: an open stream socket can look alive for a while after Wi-Fi drops.
 */
export function LiveIndicator({ state }: { state: StreamState }) {
  const isOnline = useSyncExternalStore(subscribeOnline, () => navigator.onLine, () => true);
  const shown = isOnline ? state : "offline";
  const isLive = shown === "live";
  return (
    <span
      role="status"
      data-state={shown}
      title={
        shown === "offline"
          ? "No network: what you enter is kept on this device and sent when the connection returns"
          : isLive
            ? "New readings appear as they arrive"
            : "Updates are paused; values refresh every minute meanwhile"
      }
      className={`inline-flex items-center gap-2 rounded-full border-2 px-3 py-1 text-base font-semibold ${
        isLive ? "border-ok/40 text-ok" : "border-line text-muted"
      }`}
    >
      <span
        aria-hidden="true"
        className={`size-2.5 rounded-full ${isLive ? "bg-ok" : "border-2 border-current bg-transparent motion-safe:animate-pulse"}`}
      />
      {LABELS[shown]}
    </span>
  );
}
