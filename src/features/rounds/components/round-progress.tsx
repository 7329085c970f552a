import { useLayoutEffect, useState } from "react";
import type { CheckState } from "./bench-round-card";

/**
 * The height of the page's own sticky header (one row or two, by width and by how many links the
 * role has), so this bar sticks just below it instead of under it.
 */
function useHeaderHeight(): number {
  const [height, setHeight] = useState(0);
  useLayoutEffect(() => {
    const header = document.querySelector("header");
    if (!header) return;
    const update = () => setHeight(Math.round(header.getBoundingClientRect().height));
    update();
    if (typeof ResizeObserver === "undefined") return;
    const observer = new ResizeObserver(update);
    observer.observe(header);
    return () => observer.disconnect();
  }, []);
  return height;
}

type RoundProgressProps = {
  benches: { benchId: number; benchName: string; check: CheckState }[];
};

/**
 * How far the round has got, and one chip per bench in walking order to jump to its card (a
 * tick once checked). Sticky under the header, so the count stays in sight while walking.
 */
export function RoundProgress({ benches }: RoundProgressProps) {
  const checked = benches.filter((b) => b.check.kind !== "unchecked").length;
  const top = useHeaderHeight();
  return (
    <nav aria-label="Benches of this round" style={{ top }} className="sticky z-10 -mx-4 border-b-2 border-line bg-page/95 px-4 py-2 backdrop-blur sm:-mx-6 sm:px-6">
      <p className="text-lg font-bold" role="status">
        {checked} of {benches.length} benches checked
      </p>
      <ol className="mt-1 flex gap-2 overflow-x-auto pb-1">
        {benches.map((b, i) => (
          <li key={b.benchId} className="shrink-0">
            <a
              href={`#bench-${b.benchId}`}
              className={`inline-flex min-h-touch items-center gap-1 rounded-lg border-2 px-3 text-base font-bold ${
                b.check.kind === "checked" ? "border-ok bg-ok-soft text-ok" : b.check.kind === "waiting" ? "border-dashed border-high bg-high-soft text-ink" : "border-line bg-surface text-ink"
              }`}
            >
              {b.check.kind !== "unchecked" && <span aria-hidden="true">✓</span>}
              <span className="sr-only">{i + 1}. </span>
              {b.benchName}
              <span className="sr-only">{b.check.kind === "checked" ? ", checked" : b.check.kind === "waiting" ? ", checked, waiting to send" : ", not checked"}</span>
            </a>
          </li>
        ))}
      </ol>
    </nav>
  );
}
