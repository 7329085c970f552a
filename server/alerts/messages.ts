import { celsiusDeltaToFahrenheit, formatQuantity, type TemperatureUnit } from "../../shared/domain/units.js";
import type { AlertView } from "../../shared/schemas/alerts.js";
import type { Quantity } from "../../shared/schemas/quantities.js";
import type { NoticeType } from "../db/entities/alert.entity.js";

export interface MessageContext {
  type: NoticeType;
  recipient: { name: string; unit: TemperatureUnit };
  zoneName: string;
  siteName: string;
  timeZone: string;
  alerts: AlertView[];
  /** One link that acknowledges every alert of the message; null for an all-clear. */
  ackUrl: string | null;
  appUrl: string;
  nowMs: number;
  /** Why the recipient gets it, in a few words ("you are on duty for House 1"). */
  reason: string;
}

export interface ComposedMessage {
  subject: string;
  text: string;
  html: string;
}

function clock(timeMs: number, timeZone: string, nowMs: number): string {
  const sameDay = new Intl.DateTimeFormat("en-CA", { timeZone, dateStyle: "short" });
  const time = new Intl.DateTimeFormat("en-GB", { timeZone, hour: "2-digit", minute: "2-digit" }).format(timeMs);
  if (sameDay.format(timeMs) === sameDay.format(nowMs)) return time;
  return `${new Intl.DateTimeFormat("en-GB", { timeZone, weekday: "short", day: "numeric", month: "short" }).format(timeMs)} ${time}`;
}

function minutesAgo(sinceMs: number, nowMs: number): string {
  const minutes = Math.max(0, Math.round((nowMs - sinceMs) / 60_000));
  if (minutes < 90) return `${minutes} min`;
  return `${Math.floor(minutes / 60)} h ${minutes % 60} min`;
}

function value(quantity: string, v: number, unit: TemperatureUnit): string {
  return formatQuantity(quantity as Quantity, v, unit);
}

/** "59.0 °F (window 70.0–80.0 °F), lowest 58.1 °F" for a window alert; a margin for condensation. */
export function describeValues(alert: AlertView, unit: TemperatureUnit): string {
  if (alert.kind === "sensor-silent") return "no reading received";
  if (alert.kind === "condensation") {
    if (alert.lastValue === null) return "";
    if (alert.lastValue < 0.05) return "air at its dew point: leaves and surfaces are getting wet";
    const margin = unit === "F" ? `${celsiusDeltaToFahrenheit(alert.lastValue).toFixed(1)} °F` : `${alert.lastValue.toFixed(1)} °C`;
    return `air only ${margin} above its dew point`;
  }
  if (!alert.quantity || alert.lastValue === null) return "";
  const parts = [value(alert.quantity, alert.lastValue, unit)];
  if (alert.windowMin !== null && alert.windowMax !== null) {
    const [lo, hi] = [value(alert.quantity, alert.windowMin, unit), value(alert.quantity, alert.windowMax, unit)];
    parts.push(`(window ${lo.split(" ")[0]}–${hi})`);
  }
  if (alert.worstValue !== null && alert.worstValue !== alert.lastValue) {
    parts.push(`${alert.direction === "below" ? "lowest" : "highest"} ${value(alert.quantity, alert.worstValue, unit)}`);
  }
  return parts.join(" ");
}

const SUBJECT_PREFIX: Record<NoticeType, string> = {
  raised: "ALERT",
  reminder: "STILL OUT",
  escalation: "NOT ACKNOWLEDGED",
  cleared: "All clear",
};

function subjectFor(ctx: MessageContext): string {
  const [first] = ctx.alerts;
  if (!first) return `${SUBJECT_PREFIX[ctx.type]}: ${ctx.zoneName}`;
  if (ctx.type === "cleared") {
    return ctx.alerts.length === 1
      ? `All clear: ${ctx.zoneName}, ${first.benchName} back in window`
      : `All clear: ${ctx.alerts.length} alerts in ${ctx.zoneName} back in window`;
  }
  if (ctx.alerts.length === 1) {
    const v = first.kind === "window" && first.quantity && first.lastValue !== null ? ` ${value(first.quantity, first.lastValue, ctx.recipient.unit)}` : "";
    return `${SUBJECT_PREFIX[ctx.type]} ${ctx.zoneName}, ${first.benchName}: ${first.summary.toLowerCase()}${v}`;
  }
  const benches = new Set(ctx.alerts.map((a) => a.benchId)).size;
  const kinds = [...new Set(ctx.alerts.map((a) => a.summary.toLowerCase()))];
  return `${SUBJECT_PREFIX[ctx.type]} ${ctx.zoneName}: ${benches} bench${benches === 1 ? "" : "es"}, ${kinds.slice(0, 2).join(", ")}${kinds.length > 2 ? "…" : ""}`;
}

function opening(ctx: MessageContext): string {
  const n = ctx.alerts.length;
  switch (ctx.type) {
    case "raised":
      return n === 1 ? `A bench in ${ctx.zoneName} is out of its rooting window.` : `${n} alerts in ${ctx.zoneName} went off together.`;
    case "reminder":
      return `Still out of window and nobody has acknowledged yet.`;
    case "escalation":
      return `Nobody has acknowledged ${n === 1 ? "this alert" : "these alerts"} yet. You get this as a manager.`;
    case "cleared":
      return n === 1 ? `Back in window.` : `${n} alerts are back in window.`;
  }
}

function escapeHtml(text: string): string {
  return text.replaceAll("&", "&amp;").replaceAll("<", "&lt;").replaceAll(">", "&gt;").replaceAll('"', "&quot;");
}

/** The e-mail for one recipient: plain text and HTML that read well on a phone, in their unit. */
export function composeMessage(ctx: MessageContext): ComposedMessage {
  const unit = ctx.recipient.unit;
  // Bench by bench, in the order a grower walks them; on one bench, out-of-window before the rest.
  const KIND_ORDER = { window: 0, condensation: 1, "sensor-silent": 2 } as const;
  const ordered = [...ctx.alerts].sort(
    (a, b) => a.benchName.localeCompare(b.benchName, "en", { numeric: true }) || KIND_ORDER[a.kind] - KIND_ORDER[b.kind],
  );
  const lines = ordered.map((a) => {
    const head = `${a.benchName}: ${a.summary}`;
    const detail = describeValues(a, unit);
    const since = ctx.type === "cleared" && a.clearedAtMs
      ? `out from ${clock(a.sinceMs, ctx.timeZone, ctx.nowMs)} to ${clock(a.clearedAtMs, ctx.timeZone, ctx.nowMs)}`
      : `since ${clock(a.sinceMs, ctx.timeZone, ctx.nowMs)} (${minutesAgo(a.sinceMs, ctx.nowMs)})`;
    const who = a.acknowledgedByName ? `, acknowledged by ${a.acknowledgedByName}` : "";
    return { head, detail, since: since + who, url: `${ctx.appUrl}/benches/${a.benchId}` };
  });

  const text = [
    `${opening(ctx)}`,
    `${ctx.siteName} · ${ctx.zoneName}`,
    "",
    ...lines.flatMap((l) => [`• ${l.head}`, ...(l.detail ? [`  ${l.detail}`] : []), `  ${l.since}`, ""]),
    ...(ctx.ackUrl ? [`I've got it — acknowledge (one tap, no sign-in needed):`, ctx.ackUrl, ""] : []),
    `Dashboard: ${ctx.appUrl}/`,
    "",
    `You get this because ${ctx.reason}.`,
    "Benchwarden is a monitor, not a safety device: heaters keep their own high-limit and frost cut-outs.",
  ].join("\n");

  const rows = lines
    .map(
      (l) =>
        `<tr><td style="padding:8px 0;border-bottom:1px solid #ddd"><a href="${escapeHtml(l.url)}" style="font-size:18px;font-weight:700;color:#102a43">${escapeHtml(l.head)}</a>` +
        (l.detail ? `<div style="font-size:16px">${escapeHtml(l.detail)}</div>` : "") +
        `<div style="font-size:14px;color:#444">${escapeHtml(l.since)}</div></td></tr>`,
    )
    .join("");
  const button = ctx.ackUrl
    ? `<p style="margin:20px 0"><a href="${escapeHtml(ctx.ackUrl)}" style="display:inline-block;padding:14px 22px;background:#1d4e89;color:#fff;font-size:18px;font-weight:700;text-decoration:none;border-radius:10px">I've got it — acknowledge</a></p><p style="font-size:13px;color:#555">One tap, no sign-in needed. Opening the page changes nothing until you tap.</p>`
    : "";
  const html = `<!doctype html><html><body style="margin:0;padding:16px;font-family:system-ui,sans-serif;color:#111;max-width:560px">
<p style="font-size:18px;margin:0 0 4px">${escapeHtml(opening(ctx))}</p>
<p style="font-size:14px;color:#444;margin:0 0 12px">${escapeHtml(`${ctx.siteName} · ${ctx.zoneName}`)}</p>
<table style="width:100%;border-collapse:collapse">${rows}</table>
${button}
<p style="font-size:14px"><a href="${escapeHtml(ctx.appUrl)}/">Open the dashboard</a></p>
<p style="font-size:12px;color:#666">You get this because ${escapeHtml(ctx.reason)}. Benchwarden is a monitor, not a safety device: heaters keep their own high-limit and frost cut-outs.</p>
</body></html>`;

  return { subject: subjectFor(ctx), text, html };
}
