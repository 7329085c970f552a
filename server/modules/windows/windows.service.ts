import type { DataSource } from "typeorm";
import type { WindowedQuantity } from "../../../shared/schemas/quantities.js";
import type { QuantityWindow } from "../../../shared/schemas/windows.js";
import { BenchEntity } from "../../db/entities/bench.entity.js";
import { BenchWindowEntity, ZoneWindowEntity, type WindowLimit } from "../../db/entities/window.entity.js";

function toQuantityWindow(limit: WindowLimit): QuantityWindow {
  return { quantity: limit.quantity, min: limit.minValue, max: limit.maxValue, delayS: limit.delayS, hysteresis: limit.hysteresis };
}

/**
 * The window in force on each bench: the zone's window per quantity, replaced quantity by quantity
 * by the bench's overrides. Cached, because ingest classifies every reading; call reload() after a change.
 */
export class WindowsService {
  private byBench = new Map<number, Map<WindowedQuantity, QuantityWindow>>();
  private loaded: Promise<void> | null = null;

  constructor(private readonly dataSource: DataSource) {}

  async reload(): Promise<void> {
    const [benches, zoneWindows, benchWindows] = await Promise.all([
      this.dataSource.getRepository(BenchEntity).find(),
      this.dataSource.getRepository(ZoneWindowEntity).find(),
      this.dataSource.getRepository(BenchWindowEntity).find(),
    ]);
    const byZone = new Map<number, WindowLimit[]>();
    for (const w of zoneWindows) byZone.set(w.zoneId, [...(byZone.get(w.zoneId) ?? []), w]);
    const next = new Map<number, Map<WindowedQuantity, QuantityWindow>>();
    for (const bench of benches) {
      const effective = new Map<WindowedQuantity, QuantityWindow>();
      for (const w of byZone.get(bench.zoneId) ?? []) effective.set(w.quantity, toQuantityWindow(w));
      for (const w of benchWindows) if (w.benchId === bench.id) effective.set(w.quantity, toQuantityWindow(w));
      next.set(bench.id, effective);
    }
    this.byBench = next;
  }

  private async ensureLoaded(): Promise<void> {
    this.loaded ??= this.reload();
    await this.loaded;
  }

  /** The effective window of one quantity on a bench, if any (call after ready()). */
  windowFor(benchId: number, quantity: string): QuantityWindow | undefined {
    return this.byBench.get(benchId)?.get(quantity as WindowedQuantity);
  }

  async ready(): Promise<void> {
    await this.ensureLoaded();
  }

  async windowsOf(benchId: number): Promise<QuantityWindow[]> {
    await this.ensureLoaded();
    return [...(this.byBench.get(benchId)?.values() ?? [])];
  }
}
