import type { ReactNode } from "react";
import { Link } from "react-router-dom";
import { paths } from "../../config/paths";

type AppShellProps = {
  /** Small status shown beside the name (the live-stream indicator). */
  status?: ReactNode;
  /** Controls at the end of the header (the °F/°C switch). */
  controls?: ReactNode;
  children: ReactNode;
};

export function AppShell({ status, controls, children }: AppShellProps) {
  return (
    <div className="min-h-dvh">
      <a
        href="#main"
        className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:z-50 focus:rounded focus:bg-surface focus:p-3"
      >
        Skip to content
      </a>
      <header className="sticky top-0 z-20 border-b-2 border-line bg-page/95 backdrop-blur">
        <div className="mx-auto flex max-w-7xl flex-wrap items-center gap-x-4 gap-y-2 px-4 py-2 sm:px-6">
          <Link
            to={paths.dashboard.to()}
            className="flex min-h-touch items-center gap-2 text-2xl font-bold tracking-tight text-ink"
          >
            <LeafMark />
            Benchwarden
          </Link>
          <div className="flex min-w-0 flex-1 items-center">{status}</div>
          <div className="flex items-center gap-2">{controls}</div>
        </div>
      </header>
      <main id="main" className="mx-auto max-w-7xl px-4 pb-16 pt-4 sm:px-6">
        {children}
      </main>
    </div>
  );
}

/** A small cutting with two leaves: Benchwarden's own mark. */
function LeafMark() {
  return (
    <svg viewBox="0 0 32 32" className="size-8 text-ok" aria-hidden="true" focusable="false">
      <path d="M16 29V13" stroke="currentColor" strokeWidth="3" strokeLinecap="round" fill="none" />
      <path d="M16 16c-6 0-9-4-9-10 6 0 9 4 9 10Z" fill="currentColor" />
      <path d="M16 13c0-5 3-9 9-9 0 6-3 9-9 9Z" fill="currentColor" opacity=".7" />
    </svg>
  );
}
