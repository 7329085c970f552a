import { useQueryClient } from "@tanstack/react-query";
import { useEffect, useId, useRef, useState } from "react";
import { useLocation, useNavigate } from "react-router-dom";
import { ROLE_DESCRIPTIONS, ROLE_LABELS } from "../../../../shared/schemas/auth.js";
import { TemperatureUnitSwitch } from "../../../components/layouts/temperature-unit-switch";
import { Button } from "../../../components/ui/button";
import { useToast } from "../../../components/ui/toast";
import { paths } from "../../../config/paths";
import { useAuthorization } from "../../../lib/authorization";
import { useDeleteSession } from "../api/delete-session";

/** "Imogen Vale" → "IV"; one name → its first letter. */
function initials(name: string): string {
  const words = name.trim().split(/\s+/).filter(Boolean);
  const letters = words.length > 1 ? [words[0]!, words[words.length - 1]!] : words.slice(0, 1);
  return letters.map((w) => w[0]!.toUpperCase()).join("") || "?";
}

/** The signed-in person's name and role in the header; opens their unit preference and sign-out. */
export function UserMenu() {
  const { user } = useAuthorization();
  const [isOpen, setIsOpen] = useState(false);
  const panelId = useId();
  const rootRef = useRef<HTMLDivElement>(null);
  const buttonRef = useRef<HTMLButtonElement>(null);
  const location = useLocation();
  const navigate = useNavigate();
  const queryClient = useQueryClient();
  const { showToast } = useToast();
  const signOut = useDeleteSession();

  // A new page closes the menu.
  useEffect(() => setIsOpen(false), [location.pathname]);

  useEffect(() => {
    if (!isOpen) return;
    const onPointerDown = (event: PointerEvent) => {
      if (!rootRef.current?.contains(event.target as Node)) setIsOpen(false);
    };
    const onKeyDown = (event: KeyboardEvent) => {
      if (event.key === "Escape") {
        setIsOpen(false);
        buttonRef.current?.focus();
      }
    };
    document.addEventListener("pointerdown", onPointerDown);
    document.addEventListener("keydown", onKeyDown);
    return () => {
      document.removeEventListener("pointerdown", onPointerDown);
      document.removeEventListener("keydown", onKeyDown);
    };
  }, [isOpen]);

  function onSignOut() {
    signOut.mutate(undefined, {
      onSuccess: async () => {
        // Leave the signed-in pages first, then forget their data, so nothing refetches on the way out.
        await navigate(paths.signIn.to(), { replace: true });
        queryClient.removeQueries();
      },
      onError: (error) => showToast(`Not signed out: ${error.message}`, "error"),
    });
  }

  return (
    <div ref={rootRef} className="relative">
      <button
        ref={buttonRef}
        type="button"
        aria-expanded={isOpen}
        aria-controls={panelId}
        onClick={() => setIsOpen((open) => !open)}
        className="flex min-h-touch min-w-touch items-center justify-center gap-2 rounded-lg border-2 border-line bg-surface px-2 text-left hover:border-accent sm:px-3"
      >
        {/* On a phone the header has room for initials only; the name and role are in the menu. */}
        <span aria-hidden="true" className="flex size-8 items-center justify-center rounded-full bg-ink text-base font-bold text-page sm:hidden">
          {initials(user.name)}
        </span>
        <span className="hidden flex-col leading-tight sm:flex">
          <span className="max-w-[10rem] truncate text-lg font-semibold">{user.name}</span>
          <span className="text-sm text-muted">{ROLE_LABELS[user.role]}</span>
        </span>
        <span aria-hidden="true" className={`hidden text-sm transition-transform sm:inline ${isOpen ? "rotate-180" : ""}`}>
          ▼
        </span>
        <span className="sr-only sm:hidden">
          {user.name}, {ROLE_LABELS[user.role]}
        </span>
        <span className="sr-only">: your account</span>
      </button>
      {isOpen && (
        <div
          id={panelId}
          className="absolute right-0 top-full z-30 mt-2 w-[min(22rem,calc(100vw-2rem))] rounded-2xl border-2 border-line bg-surface p-4 text-ink shadow-xl"
        >
          <p className="text-xl font-bold">{user.name}</p>
          <p className="break-all text-base text-muted">{user.email}</p>
          <p className="mt-2 text-base">
            <span className="font-semibold">{ROLE_LABELS[user.role]}:</span> {ROLE_DESCRIPTIONS[user.role].toLowerCase()}
          </p>
          <div className="mt-4 border-t-2 border-line pt-4">
            <p className="mb-2 text-lg font-semibold">Show temperatures in</p>
            <TemperatureUnitSwitch />
            <p className="mt-1 text-base text-muted">Saved to your account, on every device.</p>
          </div>
          <div className="mt-4 border-t-2 border-line pt-4">
            <Button onClick={onSignOut} isBusy={signOut.isPending} className="w-full">
              Sign out
            </Button>
          </div>
        </div>
      )}
    </div>
  );
}
