import { createContext, use, useCallback, useEffect, useMemo, useRef, useState, type ReactNode } from "react";

export type ToastTone = "success" | "error" | "info";
type Toast = { id: number; tone: ToastTone; message: string };

type ToastValue = { showToast: (message: string, tone?: ToastTone) => void };

const ToastContext = createContext<ToastValue | null>(null);

/** How long a toast stays; errors stay longer, and any toast can be closed by hand. */
const TOAST_MS: Record<ToastTone, number> = { success: 5_000, info: 5_000, error: 10_000 };

const TONE_CLASSES: Record<ToastTone, string> = {
  success: "border-ok",
  info: "border-accent",
  error: "border-high",
};

/** Short messages after an action (STYLE.md §3: a failed mutation shows a toast). */
export function ToastProvider({ children }: { children: ReactNode }) {
  const [toasts, setToasts] = useState<Toast[]>([]);
  const nextId = useRef(1);
  const timers = useRef(new Map<number, number>());

  const dismiss = useCallback((id: number) => {
    setToasts((current) => current.filter((t) => t.id !== id));
    window.clearTimeout(timers.current.get(id));
    timers.current.delete(id);
  }, []);

  const showToast = useCallback(
    (message: string, tone: ToastTone = "success") => {
      const id = nextId.current++;
      // At most three at a time: old news makes room.
      setToasts((current) => [...current.slice(-2), { id, tone, message }]);
      timers.current.set(id, window.setTimeout(() => dismiss(id), TOAST_MS[tone]));
    },
    [dismiss],
  );

  useEffect(() => {
    const pending = timers.current;
    return () => {
      for (const timer of pending.values()) window.clearTimeout(timer);
      pending.clear();
    };
  }, []);

  const value = useMemo(() => ({ showToast }), [showToast]);
  return (
    <ToastContext value={value}>
      {children}
      <div aria-live="polite" className="pointer-events-none fixed inset-x-0 bottom-0 z-50 flex flex-col items-center gap-2 p-3 sm:items-end">
        {toasts.map((toast) => (
          <div
            key={toast.id}
            role={toast.tone === "error" ? "alert" : "status"}
            data-tone={toast.tone}
            className={`pointer-events-auto flex w-full max-w-sm items-start gap-2 rounded-xl border-2 border-l-8 bg-surface px-3 py-1 text-base text-ink shadow-lg ${TONE_CLASSES[toast.tone]}`}
          >
            <p className="flex-1 py-2.5 font-semibold">{toast.message}</p>
            <button
              type="button"
              onClick={() => dismiss(toast.id)}
              className="min-h-touch min-w-touch rounded-lg text-base font-semibold text-muted hover:text-ink"
              aria-label="Close message"
            >
              ✕
            </button>
          </div>
        ))}
      </div>
    </ToastContext>
  );
}

export function useToast(): ToastValue {
  const value = use(ToastContext);
  if (!value) throw new Error("useToast must be used inside <ToastProvider>");
  return value;
}
