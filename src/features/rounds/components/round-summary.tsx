import type { ReactNode } from "react";
import type { TemperatureUnit } from "../../../../shared/domain/units.js";
import { FLAG_LABELS, STAGE_LABELS } from "../../../../shared/schemas/batches.js";
import type { RoundSummary } from "../../../../shared/schemas/rounds.js";
import { formatValueParts } from "../../../lib/display-value";
import { OUT_OF_WINDOW_WORDS, QUANTITY_LABELS } from "../../../lib/quantity-labels";
import { formatMinutes, formatSiteDateTime, formatSiteTime } from "../utils/round-words";

function Stat({ label, value, tone = "plain" }: { label: string; value: ReactNode; tone?: "plain" | "warn" | "good" }) {
  const tones = { plain: "border-line bg-surface", warn: "border-high bg-high-soft", good: "border-ok bg-ok-soft" };
  return (
    <div className={`rounded-xl border-2 p-3 ${tones[tone]}`}>
      <dt className="text-base font-semibold text-muted">{label}</dt>
      <dd className="text-4xl font-bold tabular-nums">{value}</dd>
    </div>
  );
}

/**
 * What a finished walk-through found, as it was saved and mailed: who and when, benches checked,
 * problems (alerts of the checked benches and flagged observations), observations and photos.
 */
export function RoundSummaryView({ summary, unit, photos }: { summary: RoundSummary; unit: TemperatureUnit; photos?: ReactNode }) {
  const tz = summary.timeZone;
  const { problems } = summary;
  const benchesOut = summary.benches.filter((b) => b.outOfWindow.length > 0);
  return (
    <div className="flex flex-col gap-6">
      <section aria-labelledby="summary-who">
        <h2 id="summary-who" className="sr-only">
          Who and when
        </h2>
        <p className="text-xl">
          Walked by <strong>{summary.walkedBy.length > 0 ? summary.walkedBy.join(", ") : summary.startedBy.name}</strong>
        </p>
        <p className="text-lg">
          Started {formatSiteDateTime(summary.startedAtMs, tz)} by {summary.startedBy.name} · finished {formatSiteTime(summary.finishedAtMs, tz, false)} by {summary.finishedBy.name} (
          {summary.finishedAtMs - summary.startedAtMs < 60_000 ? "under a minute" : formatMinutes((summary.finishedAtMs - summary.startedAtMs) / 60_000)})
        </p>
        {summary.mailedTo.length > 0 && <p className="text-base text-muted">Mailed to {summary.mailedTo.join(", ")}</p>}
      </section>

      <dl className="grid grid-cols-2 gap-3 sm:grid-cols-4">
        <Stat label="Benches checked" value={`${summary.checkedCount} of ${summary.benchCount}`} tone={summary.checkedCount === summary.benchCount ? "good" : "warn"} />
        <Stat label="Problems found" value={problems.count} tone={problems.count > 0 ? "warn" : "good"} />
        <Stat label="Observations" value={summary.observationCount} />
        <Stat label="Photos" value={summary.photoCount} />
      </dl>

      {summary.notChecked.length > 0 && (
        <section aria-labelledby="summary-unchecked" className="rounded-xl border-2 border-high bg-high-soft p-4">
          <h2 id="summary-unchecked" className="text-2xl font-bold">
            Not checked
          </h2>
          <ul className="mt-1 list-disc pl-6 text-lg">
            {summary.notChecked.map((b) => (
              <li key={b.benchId}>
                {b.benchName} ({b.zoneName})
              </li>
            ))}
          </ul>
        </section>
      )}

      <section aria-labelledby="summary-problems">
        <h2 id="summary-problems" className="text-2xl font-bold">
          Problems
        </h2>
        {problems.count === 0 ? (
          <p className="text-lg">No alerts and nothing flagged on the checked benches.</p>
        ) : (
          <ul className="mt-2 flex flex-col gap-2">
            {problems.alerts.map((a) => (
              <li key={`a-${a.alertId}`} className="rounded-xl border-2 border-high bg-surface p-3">
                <p className="text-lg font-bold">
                  {a.summary} · {a.benchName}
                </p>
                <p className="text-base">
                  {a.zoneName} · from {formatSiteTime(a.sinceMs, tz)}
                  {a.clearedAtMs ? ` to ${formatSiteTime(a.clearedAtMs, tz)}` : ", still open"}
                </p>
              </li>
            ))}
            {problems.observations.map((o) => (
              <li key={`o-${o.observationId}`} className="rounded-xl border-2 border-high bg-surface p-3">
                <p className="text-lg font-bold">
                  {o.variety} · {o.benchName}
                </p>
                <p className="text-base">
                  {STAGE_LABELS[o.stage]} · {o.flags.map((f) => FLAG_LABELS[f].toLowerCase()).join(", ")}
                  {o.note ? ` — “${o.note}”` : ""}
                  {o.photoCount > 0 ? ` (${o.photoCount === 1 ? "1 photo" : `${o.photoCount} photos`})` : ""}
                </p>
              </li>
            ))}
          </ul>
        )}
      </section>

      {benchesOut.length > 0 && (
        <section aria-labelledby="summary-out">
          <h2 id="summary-out" className="text-2xl font-bold">
            Out of window before check-off
          </h2>
          <ul className="mt-2 flex flex-col gap-2">
            {benchesOut.map((b) => (
              <li key={b.benchId} className="rounded-xl border-2 border-line bg-surface p-3">
                <p className="text-lg font-bold">
                  {b.benchName} · {b.zoneName}
                </p>
                <ul className="text-base">
                  {b.outOfWindow.map((q) => {
                    const words = OUT_OF_WINDOW_WORDS[q.quantity];
                    const low = q.min === null ? null : formatValueParts(q.quantity, q.min, unit).text;
                    const high = q.max === null ? null : formatValueParts(q.quantity, q.max, unit).text;
                    return (
                      <li key={q.quantity}>
                        {QUANTITY_LABELS[q.quantity]}: {[q.belowMinutes > 0 ? `${words.below.toLowerCase()} ${formatMinutes(q.belowMinutes)}` : null, q.aboveMinutes > 0 ? `${words.above.toLowerCase()} ${formatMinutes(q.aboveMinutes)}` : null].filter(Boolean).join(", ")}
                        {low && high ? ` (lowest ${low}, highest ${high})` : ""}
                      </li>
                    );
                  })}
                </ul>
              </li>
            ))}
          </ul>
        </section>
      )}

      <section aria-labelledby="summary-benches">
        <h2 id="summary-benches" className="text-2xl font-bold">
          Benches
        </h2>
        <ul className="mt-2 grid gap-2 sm:grid-cols-2">
          {summary.benches.map((b) => (
            <li key={b.benchId} className="rounded-xl border-2 border-line bg-surface p-3">
              <p className="text-lg font-bold">{b.benchName}</p>
              <p className="text-base">
                {b.check ? `Checked ${formatSiteTime(b.check.atMs, tz, false)} by ${b.check.by.name}` : "Not checked"}
                {b.check?.note ? ` — “${b.check.note}”` : ""}
              </p>
              {b.check && b.quantities.length > 0 && b.quantities.every((q) => q.readingCount === 0) && (
                <p className="text-base font-semibold text-high">No readings in the period: are its probes reporting?</p>
              )}
            </li>
          ))}
        </ul>
      </section>

      {photos}
    </div>
  );
}
