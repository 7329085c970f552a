import type { QuantityWindow, WindowStatus } from "../schemas/windows.js";

/**
 * Where one value stands against its window: strictly below min is "below", strictly above max
 * is "above", the limits themselves are inside. No window or a non-finite value is "unknown".
 */
export function classifyValue(value: number, window: Pick<QuantityWindow, "min" | "max"> | undefined): WindowStatus {
  if (!window || !Number.isFinite(value)) return "unknown";
  if (value < window.min) return "below";
  if (value > window.max) return "above";
  return "inside";
}

/** The worst of several statuses: any out-of-window beats inside; unknown only when nothing is known. */
export function combineStatuses(statuses: readonly WindowStatus[]): WindowStatus {
  const known = statuses.filter((s) => s !== "unknown");
  if (known.length === 0) return "unknown";
  return known.find((s) => s !== "inside") ?? "inside";
}
