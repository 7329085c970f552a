import type { ReactNode } from "react";
import { Link } from "react-router-dom";
import { paths } from "../../config/paths";
import { LeafMark } from "../ui/leaf-mark";

type AppShellProps = {
  /** Small status shown beside the name (the live-stream indicator). */
  status?: ReactNode;
  /** The page links (only those the role may open). */
  nav?: ReactNode;
  /** The end of the header: the signed-in user's menu. */
  account?: ReactNode;
  children: ReactNode;
};

export function AppShell({ status, nav, account, children }: AppShellProps) {
  return (
    <div className="min-h-dvh">
      <a
        href="#main"
        className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:z-50 focus:rounded focus:bg-surface focus:p-3"
      >
        Skip to content
      </a>
      <header className="sticky top-0 z-20 border-b-2 border-line bg-page/95 backdrop-blur">
        <div className="mx-auto flex max-w-7xl flex-wrap items-center gap-x-4 gap-y-1 px-4 py-2 sm:px-6">
          <Link
            to={paths.dashboard.to()}
            className="flex min-h-touch items-center gap-2 text-2xl font-bold tracking-tight text-ink"
          >
            <LeafMark />
            Benchwarden
          </Link>
          <div className="flex min-w-0 flex-1 items-center">{status}</div>
          {/* On a phone the links take a row of their own below the name; from a tablet up they sit in line. */}
          {nav && <div className="order-last w-full lg:order-none lg:w-auto">{nav}</div>}
          {account && <div className="flex items-center gap-2">{account}</div>}
        </div>
      </header>
      <main id="main" className="mx-auto max-w-7xl px-4 pb-16 pt-4 sm:px-6">
        {children}
      </main>
    </div>
  );
}
