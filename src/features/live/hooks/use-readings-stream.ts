import { useEffect, useRef, useState } from "react";
import type { z } from "zod";
import { alertsEventSchema } from "../../../../shared/schemas/alerts.js";
import { readingsEventSchema, type ReadingsEvent } from "../../../../shared/schemas/stream.js";

export type AlertsEvent = z.infer<typeof alertsEventSchema>;

export const STREAM_URL = "/api/stream";

/** "connecting" before the first open, "live" while open, "reconnecting" after it dropped. */
export type StreamState = "connecting" | "live" | "reconnecting";

type StreamHandlers = {
  onReadings: (event: ReadingsEvent) => void;
  /** Event "alerts": alerts that changed (alertsEventSchema). */
  onAlerts?: (event: AlertsEvent) => void;
  /** Called when the stream opens again after a drop: whatever was missed should be refetched. */
  onReconnect?: () => void;
};

const RETRY_MIN_MS = 1_000;
const RETRY_MAX_MS = 30_000;
// EventSource.CLOSED; spelled out so a test double need not copy the static constants.
const CLOSED = 2;

// Every event is JSON checked against its shared schema; anything else is dropped, not thrown.
function parse<S extends z.ZodType>(type: string, schema: S, event: MessageEvent<string>): z.output<S> | undefined {
  let json: unknown;
  try {
    json = JSON.parse(event.data);
  } catch {
    console.warn(`${type} stream: an event was not JSON`, event.data);
    return undefined;
  }
  const parsed = schema.safeParse(json);
  if (!parsed.success) {
    console.warn(`${type} stream: an event did not match the schema`, parsed.error.issues);
    return undefined;
  }
  return parsed.data;
}

/**
 * Subscribes to the server-sent stream: event "readings" (readingsEventSchema) and event "alerts"
 * (alertsEventSchema).
 * The browser's EventSource retries on its own after a network drop; when it gives up (an HTTP
 * error answer closes it for good) this hook opens a new one with exponential back-off.
 */
export function useReadingsStream(handlers: StreamHandlers, url = STREAM_URL): StreamState {
  const [state, setState] = useState<StreamState>("connecting");
  const handlersRef = useRef(handlers);
  useEffect(() => {
    handlersRef.current = handlers;
  });

  useEffect(() => {
    if (typeof EventSource === "undefined") return;
    let source: EventSource | null = null;
    let retryTimer: number | undefined;
    let failures = 0;
    let hasDropped = false;
    let isDisposed = false;

    const onOpen = () => {
      failures = 0;
      setState("live");
      if (hasDropped) handlersRef.current.onReconnect?.();
      hasDropped = false;
    };

    const onReadings = (event: MessageEvent<string>) => {
      const data = parse("readings", readingsEventSchema, event);
      if (data) handlersRef.current.onReadings(data);
    };

    const onAlerts = (event: MessageEvent<string>) => {
      const data = parse("alerts", alertsEventSchema, event);
      if (data) handlersRef.current.onAlerts?.(data);
    };

    const onError = () => {
      if (isDisposed) return;
      hasDropped = true;
      setState("reconnecting");
      if (source && source.readyState === CLOSED) {
        source.close();
        const delayMs = Math.min(RETRY_MAX_MS, RETRY_MIN_MS * 2 ** failures);
        failures += 1;
        retryTimer = window.setTimeout(connect, delayMs);
      }
    };

    function connect() {
      if (isDisposed) return;
      source = new EventSource(url);
      source.addEventListener("open", onOpen);
      source.addEventListener("readings", onReadings as EventListener);
      source.addEventListener("alerts", onAlerts as EventListener);
      source.addEventListener("error", onError);
    }

    connect();
    return () => {
      isDisposed = true;
      window.clearTimeout(retryTimer);
      source?.close();
    };
  }, [url]);

  return state;
}
