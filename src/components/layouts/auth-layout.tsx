import type { ReactNode } from "react";
import { LeafMark } from "../ui/leaf-mark";

/** The frame of the pages used before signing in: the name, one card, nothing else. */
export function AuthLayout({ title, children }: { title: string; children: ReactNode }) {
  return (
    <div className="min-h-dvh px-4 py-8 sm:py-16">
      <main id="main" className="mx-auto w-full max-w-md">
        <p className="mb-6 flex items-center justify-center gap-2 text-3xl font-bold tracking-tight">
          <LeafMark className="size-10" />
          Benchwarden
        </p>
        <div className="rounded-2xl border-2 border-line bg-surface p-5 shadow-sm sm:p-7">
          <h1 className="mb-4 text-3xl font-bold">{title}</h1>
          {children}
        </div>
      </main>
    </div>
  );
}
