import { useEffect, useState } from "react";

/** The current time, refreshed every `intervalMs`, so "5 min ago" keeps counting without new data. */
export function useNow(intervalMs = 15_000): number {
  const [nowMs, setNowMs] = useState(() => Date.now());
  useEffect(() => {
    const timer = window.setInterval(() => setNowMs(Date.now()), intervalMs);
    return () => window.clearInterval(timer);
  }, [intervalMs]);
  return nowMs;
}
