import { useEffect, useId, useLayoutEffect, useRef, useState, type RefObject } from "react";

/**
 * Something a grower saw, to mark on a history chart at the moment it was seen: composed by the
 * route from the walk-through observations (features/batches), so this feature needs no batch words.
 */
export type ObservationMarker = {
  id: string;
  timeMs: number;
  /** When, in words ("Tue 4 Mar, 07:42", or a date alone when only the date is known). */
  when: string;
  /** The batch and what was seen: "Copper Lantern · Callused". */
  title: string;
  /** Further lines: bench, counts, flags, note, who. */
  details: readonly string[];
  /** Something was flagged (mould, rot, too wet…): the mark is filled rather than hollow. */
  isFlagged: boolean;
};

/**
 * Where the plot area of our charts starts and ends inside the chart's width (the y axis is 52 px
 * wide with no left margin; the right margin is 12 px: reading-chart.tsx, multi-line-chart.tsx),
 * so the lane's marks line up with their moment on the time axis.
 */
export const PLOT_LEFT_PX = 52;
export const PLOT_RIGHT_PX = 12;

/** Marks closer than this share one button (a morning round records every batch of a bench at once). */
const MIN_GAP_PX = 36;

type Cluster = { key: string; fraction: number; markers: ObservationMarker[] };

/** Groups marks that would overlap at this width; each group sits at the mean of its marks. */
export function clusterMarkers(markers: readonly ObservationMarker[], fromMs: number, toMs: number, widthPx: number): Cluster[] {
  const spanMs = toMs - fromMs;
  const inRange = markers.filter((m) => m.timeMs >= fromMs && m.timeMs <= toMs).sort((a, b) => a.timeMs - b.timeMs);
  const clusters: (Cluster & { firstFraction: number })[] = [];
  for (const m of inRange) {
    const fraction = spanMs > 0 ? (m.timeMs - fromMs) / spanMs : 0;
    const last = clusters.at(-1);
    if (last && (fraction - last.firstFraction) * widthPx < MIN_GAP_PX) {
      last.markers.push(m);
      last.fraction = last.markers.reduce((s, x) => s + (x.timeMs - fromMs) / spanMs, 0) / last.markers.length;
    } else {
      clusters.push({ key: m.id, fraction, firstFraction: fraction, markers: [m] });
    }
  }
  return clusters.map(({ key, fraction, markers: ms }) => ({ key, fraction, markers: ms }));
}

function useWidth<T extends HTMLElement>(): [RefObject<T | null>, number] {
  const ref = useRef<T>(null);
  const [width, setWidth] = useState(0);
  useLayoutEffect(() => {
    const element = ref.current;
    if (!element) return;
    setWidth(element.getBoundingClientRect().width);
    if (typeof ResizeObserver === "undefined") return;
    const observer = new ResizeObserver(([entry]) => setWidth(entry?.contentRect.width ?? 0));
    observer.observe(element);
    return () => observer.disconnect();
  }, []);
  return [ref, width];
}

/** A diamond, hollow or filled: the observation's shape (alerts are a dashed line with ⚠). */
export function ObservationGlyph({ isFlagged, sizePx = 16 }: { isFlagged: boolean; sizePx?: number }) {
  const h = sizePx / 2;
  return (
    <svg width={sizePx} height={sizePx} viewBox={`0 0 ${sizePx} ${sizePx}`} aria-hidden="true" focusable="false" className="shrink-0">
      <path
        d={`M${h},1 L${sizePx - 1},${h} L${h},${sizePx - 1} L1,${h} Z`}
        fill={isFlagged ? "var(--bw-accent)" : "var(--bw-surface)"}
        stroke="var(--bw-accent)"
        strokeWidth={2.5}
        strokeLinejoin="round"
      />
    </svg>
  );
}

/**
 * A strip under a chart's plot area with one ◇ per observation (◆ when something was flagged),
 * at its moment on the time axis; marks that would overlap share one button with their count.
 * Hovering, focusing or tapping a mark shows what was seen; a second tap, Escape or a tap
 * elsewhere closes it.
 */
export function ObservationLane({ markers, fromMs, toMs }: { markers: readonly ObservationMarker[]; fromMs: number; toMs: number }) {
  const [laneRef, widthPx] = useWidth<HTMLDivElement>();
  const [open, setOpen] = useState<{ key: string; isPinned: boolean } | null>(null);
  const popoverId = useId();
  // Before the lane is measured, cluster as for a phone-width chart (never too crowded).
  const clusters = clusterMarkers(markers, fromMs, toMs, widthPx || 320);
  const active = clusters.find((c) => c.key === open?.key);

  useEffect(() => {
    if (!open) return;
    const onKey = (event: KeyboardEvent) => {
      if (event.key === "Escape") setOpen(null);
    };
    const onPointer = (event: PointerEvent) => {
      if (!laneRef.current?.contains(event.target as Node)) setOpen(null);
    };
    document.addEventListener("keydown", onKey);
    document.addEventListener("pointerdown", onPointer);
    return () => {
      document.removeEventListener("keydown", onKey);
      document.removeEventListener("pointerdown", onPointer);
    };
  }, [open, laneRef]);

  if (clusters.length === 0) return null;
  return (
    <div ref={laneRef} role="group" aria-label="Observations on this chart" className="relative h-11" style={{ marginLeft: PLOT_LEFT_PX, marginRight: PLOT_RIGHT_PX }}>
      <div aria-hidden="true" className="absolute inset-x-0 top-1/2 border-t border-line" />
      {clusters.map((c) => {
        const isOpen = open?.key === c.key;
        const first = c.markers[0]!;
        const isFlagged = c.markers.some((m) => m.isFlagged);
        const label =
          c.markers.length === 1
            ? `Observation, ${first.when}: ${first.title}${first.isFlagged ? ", flagged" : ""}`
            : `${c.markers.length} observations, ${first.when} to ${c.markers.at(-1)!.when}${isFlagged ? ", some flagged" : ""}`;
        return (
          <button
            key={c.key}
            type="button"
            data-observation-marker=""
            aria-label={label}
            aria-expanded={isOpen}
            aria-controls={isOpen ? popoverId : undefined}
            className="absolute top-0 flex h-11 min-w-11 -translate-x-1/2 items-center justify-center gap-0.5 rounded-lg px-1 font-bold text-accent hover:bg-[var(--bw-accent)]/10"
            style={{ left: `${c.fraction * 100}%` }}
            onClick={() => setOpen(isOpen && open?.isPinned ? null : { key: c.key, isPinned: true })}
            onMouseEnter={() => setOpen((o) => (o?.isPinned ? o : { key: c.key, isPinned: false }))}
            onMouseLeave={() => setOpen((o) => (o?.isPinned ? o : null))}
            onFocus={() => setOpen((o) => (o?.key === c.key ? o : { key: c.key, isPinned: false }))}
          >
            <ObservationGlyph isFlagged={isFlagged} />
            {c.markers.length > 1 && <span className="text-sm leading-none">{c.markers.length}</span>}
          </button>
        );
      })}
      {active && (
        <div
          id={popoverId}
          role="group"
          aria-label={active.markers.length === 1 ? "Observation" : `${active.markers.length} observations`}
          className="absolute bottom-full z-20 mb-1 flex max-h-80 w-max max-w-[min(22rem,80vw)] flex-col gap-3 overflow-y-auto rounded-lg border-2 border-line bg-surface px-3 py-2 text-base shadow-md"
          // Near an edge the box grows inwards, so it stays on the chart.
          style={active.fraction < 0.3 ? { left: 0 } : active.fraction > 0.7 ? { right: 0 } : { left: `${active.fraction * 100}%`, transform: "translateX(-50%)" }}
        >
          {active.markers.map((m) => (
            <div key={m.id} className="flex flex-col">
              <div className="flex items-center gap-1.5 font-semibold">
                <ObservationGlyph isFlagged={m.isFlagged} sizePx={14} />
                {m.when}
              </div>
              <div className="font-bold">{m.title}</div>
              {m.details.map((line) => (
                <div key={line}>{line}</div>
              ))}
            </div>
          ))}
        </div>
      )}
    </div>
  );
}
