/** A small cutting with two leaves: Benchwarden's own mark. */
export function LeafMark({ className = "size-8" }: { className?: string }) {
  return (
    <svg viewBox="0 0 32 32" className={`text-ok ${className}`} aria-hidden="true" focusable="false">
      <path d="M16 29V13" stroke="currentColor" strokeWidth="3" strokeLinecap="round" fill="none" />
      <path d="M16 16c-6 0-9-4-9-10 6 0 9 4 9 10Z" fill="currentColor" />
      <path d="M16 13c0-5 3-9 9-9 0 6-3 9-9 9Z" fill="currentColor" opacity=".7" />
    </svg>
  );
}
