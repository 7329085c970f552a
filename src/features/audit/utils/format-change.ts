import { celsiusDeltaToFahrenheit, formatQuantity, type TemperatureUnit } from "../../../../shared/domain/units.js";
import type { AuditAction, AuditChange, AuditEntityType, AuditEntry, AuditValue } from "../../../../shared/schemas/audit.js";
import { ROLE_LABELS } from "../../../../shared/schemas/auth.js";
import { formatDateTime } from "../../../lib/format-time";
import { QUANTITY_LABELS } from "../../../lib/quantity-labels";

/** What each audited field is called on screen. Unknown fields show their own name. */
const FIELD_WORDS: Record<string, string> = {
  min: "minimum",
  max: "maximum",
  delayS: "hold-off delay",
  hysteresis: "clearing band",
  dewPointMarginC: "dew-point margin",
  name: "name",
  description: "description",
  timeZone: "time zone",
  position: "place in the order",
  benchOrder: "walking order",
  zoneId: "zone",
  siteId: "site",
  benchId: "bench",
  archivedAtMs: "archived",
  // A duty shift (entity "duty-rota").
  userId: "person on duty",
  weekdays: "days",
  startMinute: "from",
  endMinute: "until",
  isFallback: "fallback",
  // A site's alert timing.
  escalateAfterS: "managers told after",
  renotifyEveryS: "person on duty reminded every",
  offset: "calibration offset",
  gain: "calibration gain",
};

/** Partial on purpose: a kind added to the shared enum still shows (as its own word) before it has one here. */
const ACTION_WORDS: Partial<Record<AuditAction, string>> & Record<string, string> = {
  created: "Created",
  updated: "Changed",
  archived: "Archived",
  restored: "Restored",
  deleted: "Deleted",
  "preset-applied": "Preset applied",
  reordered: "New walking order",
  assigned: "Sensor moved",
  moved: "Moved",
  closed: "Closed",
  reopened: "Reopened",
};

const ENTITY_WORDS: Partial<Record<AuditEntityType, string>> & Record<string, string> = {
  site: "Site",
  zone: "Zone",
  bench: "Bench",
  "zone-windows": "Zone windows",
  "bench-windows": "Bench windows",
  "window-preset": "Preset",
  "sensor-assignment": "Sensor on a bench",
  "sensor-calibration": "Sensor calibration",
  "duty-rota": "Duty rota",
  batch: "Batch",
};

function capitalise(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1).replaceAll("-", " ");
}

export function actionWords(action: AuditAction): string {
  return ACTION_WORDS[action] ?? capitalise(action);
}

export function entityWords(type: AuditEntityType): string {
  return ENTITY_WORDS[type] ?? capitalise(type);
}

/** "Air temperature minimum", "Dew-point margin", "Name". */
export function describeField(change: Pick<AuditChange, "field" | "quantity">): string {
  const words = FIELD_WORDS[change.field] ?? change.field;
  const text = change.quantity ? `${QUANTITY_LABELS[change.quantity]} ${words}` : words;
  return text.charAt(0).toUpperCase() + text.slice(1);
}

function formatSeconds(seconds: number): string {
  if (seconds < 60) return `${seconds} s`;
  const minutes = Math.round((seconds / 60) * 10) / 10;
  if (minutes < 60) return `${minutes} min`;
  const hours = Math.floor(minutes / 60);
  const rest = Math.round(minutes - hours * 60);
  return rest === 0 ? `${hours} h` : `${hours} h ${rest} min`;
}

/**
 * One side of a change in the reader's unit. Values arrive in SI (shared/schemas/audit.ts):
 * temperatures °C, temperature differences °C (× 1.8 for °F, no offset), humidity % RH,
 * moisture a ratio, durations seconds, times ms. Null is "none".
 */
export function formatAuditValue(change: AuditChange, side: "old" | "new", unit: TemperatureUnit): string {
  const value: AuditValue = change[side];
  const label = side === "old" ? change.oldLabel : change.newLabel;
  if (label) return label;
  if (value === null) return "none";
  if (typeof value === "boolean") return value ? "yes" : "no";
  if (typeof value === "string") return value;
  switch (change.kind) {
    case "temperature":
      return formatQuantity(change.quantity ?? "air.temperature", value, unit);
    case "temperature-difference": {
      const shown = unit === "F" ? celsiusDeltaToFahrenheit(value) : value;
      return `${Number(shown.toFixed(2))} ${unit === "F" ? "°F" : "°C"}`;
    }
    case "humidity":
      return `${Number(value.toFixed(1))} % RH`;
    case "moisture":
      return `${Number((value * 100).toFixed(1))} % VWC`;
    case "duration":
      return formatSeconds(value);
    case "time":
      return formatDateTime(value);
    case "reference":
      return `#${value}`;
    default:
      return String(value);
  }
}

/** "Air temperature minimum: 70.0 °F → 64.0 °F" as parts, so the arrow can be drawn. */
export function describeChange(change: AuditChange, unit: TemperatureUnit): { field: string; old: string; new: string } {
  return { field: describeField(change), old: formatAuditValue(change, "old", unit), new: formatAuditValue(change, "new", unit) };
}

/** "Tobias Fenwick (manager)", or the system. */
export function describeActor(actor: AuditEntry["actor"]): string {
  if (actor.userId === null && actor.role === null) return actor.name || "Benchwarden";
  return actor.role ? `${actor.name} (${ROLE_LABELS[actor.role].toLowerCase()})` : actor.name;
}
