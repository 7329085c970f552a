import type { DataSource } from "typeorm";
import { WINDOWED_QUANTITIES, type WindowedQuantity } from "../../../shared/schemas/quantities.js";
import { DEFAULT_DEW_POINT_MARGIN_C, type QuantityWindow } from "../../../shared/schemas/windows.js";
import { BenchEntity } from "../../db/entities/bench.entity.js";
import { BenchWindowEntity, ZoneWindowEntity, type WindowLimit } from "../../db/entities/window.entity.js";
import { ZoneEntity } from "../../db/entities/zone.entity.js";

export function toQuantityWindow(limit: WindowLimit): QuantityWindow {
  return { quantity: limit.quantity, min: limit.minValue, max: limit.maxValue, delayS: limit.delayS, hysteresis: limit.hysteresis };
}

export function toWindowLimit(window: QuantityWindow): WindowLimit {
  return { quantity: window.quantity, minValue: window.min, maxValue: window.max, delayS: window.delayS, hysteresis: window.hysteresis };
}

/** Windows in WINDOWED_QUANTITIES order. */
export function sortWindows(windows: readonly QuantityWindow[]): QuantityWindow[] {
  return [...windows].sort((a, b) => WINDOWED_QUANTITIES.indexOf(a.quantity) - WINDOWED_QUANTITIES.indexOf(b.quantity));
}

/**
 * The window in force on each bench: the zone's window per quantity, replaced quantity by quantity
 * by the bench's overrides; likewise the dew-point margin. Cached, because ingest classifies every
 * reading; call reload() after a change (the settings services do), and the next evaluation uses it.
 */
export class WindowsService {
  private byBench = new Map<number, Map<WindowedQuantity, QuantityWindow>>();
  private marginByBench = new Map<number, number>();
  private loaded: Promise<void> | null = null;
  /** Reloads run one after another, so a reload asked for after a commit always reads it. */
  private queue: Promise<unknown> = Promise.resolve();
  private readonly listeners = new Set<() => void>();
  private fingerprint = "";

  constructor(private readonly dataSource: DataSource) {}

  async reload(): Promise<void> {
    const next = this.queue.then(() => this.load());
    this.queue = next.catch(() => false);
    if (!(await next)) return;
    for (const listener of this.listeners) {
      try {
        listener();
      } catch {
        // A listener's failure is its own; the cache is already up to date.
      }
    }
  }

  /** Reads everything afresh; true when something differs from what was cached. */
  private async load(): Promise<boolean> {
    const [benches, zones, zoneWindows, benchWindows] = await Promise.all([
      this.dataSource.getRepository(BenchEntity).find(),
      this.dataSource.getRepository(ZoneEntity).find(),
      this.dataSource.getRepository(ZoneWindowEntity).find(),
      this.dataSource.getRepository(BenchWindowEntity).find(),
    ]);
    const zoneMargin = new Map(zones.map((z) => [z.id, z.dewPointMarginC]));
    const byZone = new Map<number, WindowLimit[]>();
    for (const w of zoneWindows) byZone.set(w.zoneId, [...(byZone.get(w.zoneId) ?? []), w]);
    const overridesByBench = new Map<number, WindowLimit[]>();
    for (const w of benchWindows) overridesByBench.set(w.benchId, [...(overridesByBench.get(w.benchId) ?? []), w]);
    const next = new Map<number, Map<WindowedQuantity, QuantityWindow>>();
    const margins = new Map<number, number>();
    for (const bench of benches) {
      const effective = new Map<WindowedQuantity, QuantityWindow>();
      for (const w of byZone.get(bench.zoneId) ?? []) effective.set(w.quantity, toQuantityWindow(w));
      for (const w of overridesByBench.get(bench.id) ?? []) effective.set(w.quantity, toQuantityWindow(w));
      next.set(bench.id, effective);
      margins.set(bench.id, bench.dewPointMarginC ?? zoneMargin.get(bench.zoneId) ?? DEFAULT_DEW_POINT_MARGIN_C);
    }
    const fingerprint = JSON.stringify([[...next].map(([id, m]) => [id, [...m.values()]]), [...margins]]);
    this.byBench = next;
    this.marginByBench = margins;
    const changed = fingerprint !== this.fingerprint;
    this.fingerprint = fingerprint;
    return changed;
  }

  private async ensureLoaded(): Promise<void> {
    this.loaded ??= this.reload();
    await this.loaded;
  }

  /** The effective window of one quantity on a bench, if any (call after ready()). */
  windowFor(benchId: number, quantity: string): QuantityWindow | undefined {
    return this.byBench.get(benchId)?.get(quantity as WindowedQuantity);
  }

  /**
   * The dew-point margin in force on a bench, °C: the bench's own, else its zone's, else 2 °C
   * (common practice, REFERENCES.md §2). Call after ready().
   */
  dewPointMarginFor(benchId: number): number {
    return this.marginByBench.get(benchId) ?? DEFAULT_DEW_POINT_MARGIN_C;
  }

  /**
   * Called after a reload that found something changed (a window, a margin, a bench moved, added or
   * removed): for an engine that wants to re-evaluate held values at once rather than at its next
   * tick. A reload that finds nothing new calls nobody. Returns an unsubscribe.
   */
  onChange(listener: () => void): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }

  async ready(): Promise<void> {
    await this.ensureLoaded();
  }

  async windowsOf(benchId: number): Promise<QuantityWindow[]> {
    await this.ensureLoaded();
    return sortWindows([...(this.byBench.get(benchId)?.values() ?? [])]);
  }
}
