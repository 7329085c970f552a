/** A quiet placeholder while a page's data loads. */
export function Loading({ label = "Loading…" }: { label?: string }) {
  return (
    <div role="status" className="flex min-h-48 items-center justify-center gap-3 text-lg text-muted">
      <span className="size-5 animate-spin rounded-full border-[3px] border-line border-t-accent" aria-hidden="true" />
      {label}
    </div>
  );
}
