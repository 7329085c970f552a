import { formatQuantity, type TemperatureUnit } from "../../../shared/domain/units.js";
import { FLAG_LABELS, STAGE_LABELS } from "../../../shared/schemas/batches.js";
import { QUANTITY_LABELS } from "../../../shared/domain/quantity-words.js";
import type { RoundSummary } from "../../../shared/schemas/rounds.js";

export interface RoundMail {
  subject: string;
  text: string;
  html: string;
}

function escapeHtml(text: string): string {
  return text.replaceAll("&", "&amp;").replaceAll("<", "&lt;").replaceAll(">", "&gt;").replaceAll('"', "&quot;");
}

function clock(timeMs: number, timeZone: string): string {
  return new Intl.DateTimeFormat("en-GB", { timeZone, hour: "2-digit", minute: "2-digit" }).format(timeMs);
}

function dayAndClock(timeMs: number, timeZone: string): string {
  return `${new Intl.DateTimeFormat("en-GB", { timeZone, weekday: "short", day: "numeric", month: "short" }).format(timeMs)} ${clock(timeMs, timeZone)}`;
}

/** Gaps shorter than this are not mentioned in the mail (the card shows every minute). */
const NO_DATA_WORTH_SAYING_MIN = 15;

function minutes(n: number): string {
  return n < 90 ? `${n} min` : `${Math.floor(n / 60)} h ${n % 60} min`;
}

/** The lines of a summary, shared by the text and HTML bodies. */
function sections(s: RoundSummary, unit: TemperatureUnit, appUrl: string) {
  const tz = s.timeZone;
  const value = (quantity: string, v: number | null) => (v === null ? "–" : formatQuantity(quantity as Parameters<typeof formatQuantity>[0], v, unit));
  const intro = [
    `Walk-through of ${s.scopeLabel} finished ${dayAndClock(s.finishedAtMs, tz)} (${s.siteName}).`,
    `Started ${clock(s.startedAtMs, tz)} by ${s.startedBy.name}; finished by ${s.finishedBy.name}.` + (s.walkedBy.length ? ` Walked by ${s.walkedBy.join(", ")}.` : ""),
    `Benches checked: ${s.checkedCount} of ${s.benchCount}.` + (s.notChecked.length ? ` Not checked: ${s.notChecked.map((b) => `${b.benchName} (${b.zoneName})`).join(", ")}.` : ""),
  ];
  const problems = [
    ...s.problems.alerts.map((a) => {
      const worst = a.quantity && a.worstValue !== null ? `, worst ${value(a.quantity, a.worstValue)}` : "";
      const until = a.clearedAtMs !== null ? `, cleared ${clock(a.clearedAtMs, tz)}` : `, still ${a.phase}`;
      return `${a.benchName} (${a.zoneName}): ${a.summary} — since ${dayAndClock(a.sinceMs, tz)}${worst}${until}`;
    }),
    ...s.problems.observations.map((o) => {
      const flags = o.flags.map((f) => FLAG_LABELS[f].toLowerCase()).join(", ");
      const photos = o.photoCount ? ` (${o.photoCount} photo${o.photoCount === 1 ? "" : "s"})` : "";
      return `${o.benchName} (${o.zoneName}), batch ${o.batchId} ${o.variety}, ${STAGE_LABELS[o.stage].toLowerCase()}: ${flags}${o.note ? ` — “${o.note}”` : ""}${photos}`;
    }),
  ];
  const benches = s.benches
    .filter((b) => b.check)
    .map((b) => {
      const head = `${b.benchName} (${b.zoneName}) — checked ${clock(b.check!.atMs, tz)} by ${b.check!.by.name}${b.check!.note ? `: “${b.check!.note}”` : ""}`;
      const lines = b.outOfWindow.map((q) => {
        const parts = [];
        if (q.belowMinutes > 0) parts.push(`below the window ${minutes(q.belowMinutes)} (lowest ${value(q.quantity, q.min)})`);
        if (q.aboveMinutes > 0) parts.push(`above the window ${minutes(q.aboveMinutes)} (highest ${value(q.quantity, q.max)})`);
        const window = q.windowMin !== null && q.windowMax !== null ? `; window ${value(q.quantity, q.windowMin)} to ${value(q.quantity, q.windowMax)}` : "";
        return `${QUANTITY_LABELS[q.quantity]}: ${parts.join(", ")}${window}`;
      });
      // Silence is not "inside": say when a probe that reported had gaps, or when nothing reported.
      for (const q of b.quantities) {
        if (q.readingCount > 0 && q.noDataMinutes >= NO_DATA_WORTH_SAYING_MIN) lines.push(`${QUANTITY_LABELS[q.quantity]}: no readings for ${minutes(q.noDataMinutes)} of the period`);
      }
      if (b.quantities.every((q) => q.readingCount === 0)) lines.push("No readings in the period: are its probes reporting?");
      return { head, lines: lines.length ? lines : ["Inside its window the whole time."] };
    });
  const footer = [
    `Observations recorded: ${s.observationCount}; photos: ${s.photoCount}.`,
    `Open the round: ${appUrl}/rounds/${s.roundId}`,
  ];
  return { intro, problems, benches, footer };
}

const DISCLAIMER = "Benchwarden is a monitor, not a safety device: heaters keep their own high-limit and frost cut-outs. Rooting hormones and fungicides: follow the label.";

/** The summary e-mail for one manager, in their °F/°C: plain text and simple HTML. */
export function composeRoundMail(s: RoundSummary, recipient: { name: string; unit: TemperatureUnit }, appUrl: string): RoundMail {
  const n = s.problems.count;
  const subject = `Walk-through ${s.scopeLabel}: ${s.checkedCount} of ${s.benchCount} benches checked, ${n === 0 ? "no problems" : `${n} problem${n === 1 ? "" : "s"}`}`;
  const { intro, problems, benches, footer } = sections(s, recipient.unit, appUrl);
  const text = [
    `Hello ${recipient.name},`,
    "",
    ...intro,
    "",
    n === 0 ? "No problems found: no alerts and no flagged observations." : `Problems found (${n}):`,
    ...problems.map((p) => `• ${p}`),
    "",
    "Benches:",
    ...benches.flatMap((b) => [`• ${b.head}`, ...b.lines.map((l) => `  ${l}`)]),
    "",
    ...footer,
    "",
    "You get this because you are a manager.",
    DISCLAIMER,
  ].join("\n");
  const li = (items: string[]) => items.map((i) => `<li style="margin:4px 0">${escapeHtml(i)}</li>`).join("");
  const html = `<!doctype html><html><body style="margin:0;padding:16px;font-family:system-ui,sans-serif;color:#111;max-width:600px">
<p style="font-size:16px">Hello ${escapeHtml(recipient.name)},</p>
${intro.map((l) => `<p style="font-size:16px;margin:4px 0">${escapeHtml(l)}</p>`).join("")}
<h2 style="font-size:18px;margin:16px 0 4px">${escapeHtml(n === 0 ? "No problems found" : `Problems found (${n})`)}</h2>
${n === 0 ? `<p style="font-size:15px">No alerts and no flagged observations.</p>` : `<ul style="font-size:15px;padding-left:20px">${li(problems)}</ul>`}
<h2 style="font-size:18px;margin:16px 0 4px">Benches</h2>
<ul style="font-size:15px;padding-left:20px">${benches.map((b) => `<li style="margin:6px 0"><strong>${escapeHtml(b.head)}</strong><ul style="padding-left:18px">${li(b.lines)}</ul></li>`).join("")}</ul>
<p style="font-size:15px">${escapeHtml(footer[0]!)}</p>
<p style="font-size:15px"><a href="${escapeHtml(`${appUrl}/rounds/${s.roundId}`)}">Open the round</a></p>
<p style="font-size:12px;color:#555">You get this because you are a manager. ${escapeHtml(DISCLAIMER)}</p>
</body></html>`;
  return { subject, text, html };
}
