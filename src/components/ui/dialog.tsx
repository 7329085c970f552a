import { useEffect, useId, useRef, type ReactNode } from "react";
import { createPortal } from "react-dom";
import { Button, type ButtonVariant } from "./button";

const FOCUSABLE = 'button:not([disabled]), [href], input:not([disabled]), select:not([disabled]), textarea:not([disabled]), [tabindex]:not([tabindex="-1"])';

type DialogProps = {
  title: string;
  onClose: () => void;
  children: ReactNode;
  /** Buttons at the bottom. */
  actions?: ReactNode;
  /** False: Escape and the backdrop do nothing; only the dialog's own buttons close it. */
  isDismissable?: boolean;
  className?: string;
};

/**
 * A modal box over the page: focus moves in and is kept there, Escape or the backdrop closes it,
 * and focus returns to what opened it.
 */
export function Dialog({ title, onClose, children, actions, isDismissable = true, className = "" }: DialogProps) {
  const titleId = useId();
  const boxRef = useRef<HTMLDivElement>(null);
  const onCloseRef = useRef(onClose);
  const isDismissableRef = useRef(isDismissable);
  useEffect(() => {
    onCloseRef.current = onClose;
    isDismissableRef.current = isDismissable;
  });

  useEffect(() => {
    const opener = document.activeElement instanceof HTMLElement ? document.activeElement : null;
    const box = boxRef.current;
    const first = box?.querySelector<HTMLElement>("[data-autofocus]") ?? box?.querySelector<HTMLElement>(FOCUSABLE);
    first?.focus();

    const onKeyDown = (event: KeyboardEvent) => {
      if (event.key === "Escape") {
        event.stopPropagation();
        if (isDismissableRef.current) onCloseRef.current();
        return;
      }
      if (event.key !== "Tab" || !box) return;
      const items = [...box.querySelectorAll<HTMLElement>(FOCUSABLE)];
      if (items.length === 0) return;
      const firstItem = items[0]!;
      const lastItem = items[items.length - 1]!;
      if (event.shiftKey && document.activeElement === firstItem) {
        event.preventDefault();
        lastItem.focus();
      } else if (!event.shiftKey && document.activeElement === lastItem) {
        event.preventDefault();
        firstItem.focus();
      }
    };
    document.addEventListener("keydown", onKeyDown);
    return () => {
      document.removeEventListener("keydown", onKeyDown);
      opener?.focus();
    };
  }, []);

  return createPortal(
    <div className="fixed inset-0 z-40 flex items-end justify-center bg-black/50 p-3 sm:items-center" onMouseDown={(e) => isDismissable && e.target === e.currentTarget && onClose()}>
      <div
        ref={boxRef}
        role="dialog"
        aria-modal="true"
        aria-labelledby={titleId}
        className={`max-h-[90dvh] w-full max-w-lg overflow-y-auto rounded-2xl border-2 border-line bg-surface p-5 text-ink shadow-xl ${className}`}
      >
        <h2 id={titleId} className="text-2xl font-bold">
          {title}
        </h2>
        <div className="mt-3 text-lg">{children}</div>
        {actions && <div className="mt-5 flex flex-wrap justify-end gap-3">{actions}</div>}
      </div>
    </div>,
    document.body,
  );
}

type ConfirmDialogProps = {
  title: string;
  children: ReactNode;
  confirmLabel: string;
  confirmVariant?: ButtonVariant;
  isBusy?: boolean;
  onConfirm: () => void;
  onCancel: () => void;
};

/** "Are you sure?" with the consequence spelled out; the safe choice has focus first. */
export function ConfirmDialog({ title, children, confirmLabel, confirmVariant = "primary", isBusy, onConfirm, onCancel }: ConfirmDialogProps) {
  return (
    <Dialog
      title={title}
      onClose={onCancel}
      actions={
        <>
          <Button data-autofocus onClick={onCancel}>
            Cancel
          </Button>
          <Button variant={confirmVariant} isBusy={isBusy} onClick={onConfirm}>
            {confirmLabel}
          </Button>
        </>
      }
    >
      {children}
    </Dialog>
  );
}
