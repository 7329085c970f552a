import { celsiusDeltaToFahrenheit, formatQuantity, type TemperatureUnit } from "../../../../shared/domain/units.js";
import type { BenchCard } from "../../../../shared/schemas/rounds.js";

const clockFormatters = new Map<string, Intl.DateTimeFormat>();

/** "Tue 18:00" in the site's time zone (a round is walked on the site's clock, not the tablet's). */
export function formatSiteTime(timeMs: number, timeZone: string, withDay = true): string {
  const key = `${timeZone}|${withDay}`;
  let f = clockFormatters.get(key);
  if (!f) {
    f = new Intl.DateTimeFormat(undefined, { timeZone, weekday: withDay ? "short" : undefined, hour: "2-digit", minute: "2-digit", hourCycle: "h23" });
    clockFormatters.set(key, f);
  }
  return f.format(new Date(timeMs));
}

/** "15 Jan, 06:10" in the site's time zone. */
export function formatSiteDateTime(timeMs: number, timeZone: string): string {
  return new Date(timeMs).toLocaleString(undefined, { timeZone, day: "numeric", month: "short", hour: "2-digit", minute: "2-digit", hourCycle: "h23" });
}

/** Where a card's figures start: "Since Tue 18:00 (the evening before)" or "Since the last round's check-off, Mon 07:12". */
export function describePeriod(period: BenchCard["period"], timeZone: string): string {
  const from = formatSiteTime(period.fromMs, timeZone);
  if (period.since === "last-round") return `Since the last round's check-off, ${from}`;
  return `Since ${from}, the evening before${period.capped ? " (at most 7 days back)" : ""}`;
}

/** "45 min", "2 h 5 min", "none". */
export function formatMinutes(minutes: number): string {
  const m = Math.round(minutes);
  if (m <= 0) return "none";
  if (m < 60) return `${m} min`;
  const h = Math.floor(m / 60);
  const rest = m % 60;
  return rest === 0 ? `${h} h` : `${h} h ${rest} min`;
}

/** A dew point (°C stored) as the user reads temperatures. */
export function formatDewPoint(valueC: number, unit: TemperatureUnit): string {
  return formatQuantity("air.temperature", valueC, unit);
}

/** A temperature difference (margin above the dew point): no offset between the scales, only the size of a degree. */
export function formatTemperatureDelta(deltaC: number, unit: TemperatureUnit): string {
  const shown = unit === "F" ? celsiusDeltaToFahrenheit(deltaC) : deltaC;
  return `${shown.toFixed(1)} ${unit === "F" ? "°F" : "°C"}`;
}

/** VPD in kPa, two decimals. */
export function formatVpd(kPa: number): string {
  return `${kPa.toFixed(2)} kPa`;
}
