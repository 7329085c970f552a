import type { ReactNode } from "react";
import type { TemperatureUnit } from "../../../../shared/domain/units.js";
import type { BenchCard, QuantityCard } from "../../../../shared/schemas/rounds.js";
import { Button } from "../../../components/ui/button";
import { PhasePill } from "../../../components/ui/phase-pill";
import { formatValueParts, formatWindowRange } from "../../../lib/display-value";
import { OUT_OF_WINDOW_WORDS, QUANTITY_LABELS } from "../../../lib/quantity-labels";
import { describePeriod, formatDewPoint, formatMinutes, formatSiteTime, formatTemperatureDelta, formatVpd } from "../utils/round-words";

export type CheckState = { kind: "checked"; atMs: number; by: string } | { kind: "waiting" } | { kind: "unchecked" };

type BenchRoundCardProps = {
  card: BenchCard;
  /** 1-based place in the walking order, and how many benches the round has. */
  place: number;
  total: number;
  unit: TemperatureUnit;
  timeZone: string;
  check: CheckState;
  /** The batches on the bench, each with its quick entry (composed by the page). */
  batches: ReactNode;
  /** Null for those who may not walk (viewers). */
  onCheck: (() => void) | null;
  onUncheck: (() => void) | null;
  isUncheckBusy?: boolean;
};

function Figure({ quantity, value, unit, label }: { quantity: QuantityCard["quantity"]; value: number | undefined; unit: TemperatureUnit; label: string }) {
  const parts = value === undefined ? null : formatValueParts(quantity, value, unit);
  return (
    <div className="flex flex-col">
      <span className="text-sm font-semibold uppercase tracking-wide text-muted">{label}</span>
      <span className="text-3xl font-bold leading-none tabular-nums">
        {parts ? (
          <>
            {parts.number} <span className="text-lg font-semibold">{parts.unit}</span>
          </>
        ) : (
          <span aria-label="no reading">—</span>
        )}
      </span>
    </div>
  );
}

/** One quantity of the card: lowest and highest in the period, and how long it was out of window. */
function QuantitySummary({ q, unit, timeZone }: { q: QuantityCard; unit: TemperatureUnit; timeZone: string }) {
  const isOut = q.minutesOutOfWindow > 0;
  const words = OUT_OF_WINDOW_WORDS[q.quantity];
  const noData = q.readingCount === 0;
  return (
    <div
      role="group"
      aria-label={QUANTITY_LABELS[q.quantity]}
      data-quantity={q.quantity}
      data-out={isOut || undefined}
      className={`flex flex-col gap-2 rounded-xl border-2 p-3 ${isOut ? "border-high bg-high-soft" : noData ? "border-dashed border-line bg-none-soft" : "border-line bg-surface"}`}
    >
      <span className="text-lg font-bold">{QUANTITY_LABELS[q.quantity]}</span>
      {noData ? (
        <p className="text-lg font-semibold text-muted">No readings in this time</p>
      ) : (
        <>
          <div className="flex gap-6">
            <Figure quantity={q.quantity} value={q.min?.value} unit={unit} label="Lowest" />
            <Figure quantity={q.quantity} value={q.max?.value} unit={unit} label="Highest" />
          </div>
          {q.min && q.max && (
            <p className="text-sm text-muted">
              low at {formatSiteTime(q.min.timeMs, timeZone, false)}, high at {formatSiteTime(q.max.timeMs, timeZone, false)}
            </p>
          )}
          <p className={`text-lg font-bold ${isOut ? "text-high" : "text-ok"}`}>
            {isOut ? (
              <>
                <span className="tabular-nums">{formatMinutes(q.minutesOutOfWindow)}</span> out of window
                <span className="block text-base font-semibold text-ink">
                  {[q.minutes.below >= 0.5 ? `${words.below}: ${formatMinutes(q.minutes.below)}` : null, q.minutes.above >= 0.5 ? `${words.above}: ${formatMinutes(q.minutes.above)}` : null]
                    .filter(Boolean)
                    .join(" · ")}
                </span>
              </>
            ) : q.window ? (
              "In window all along"
            ) : (
              "No window set"
            )}
          </p>
        </>
      )}
      {q.window && <span className="text-sm text-muted">Window {formatWindowRange({ quantity: q.quantity, ...q.window }, unit)}</span>}
      {q.minutes.noData >= 1 && !noData && <span className="text-sm font-semibold">No data for {formatMinutes(q.minutes.noData)}</span>}
    </div>
  );
}

/**
 * One bench of the walk-through: since the last round (or 18:00 the evening before), the lowest
 * and highest value of each quantity in the user's unit, minutes out of window, dew point and
 * VPD extremes, the alerts of that time, then the batches; the bench is checked off at the foot.
 */
export function BenchRoundCard({ card, place, total, unit, timeZone, check, batches, onCheck, onUncheck, isUncheckBusy }: BenchRoundCardProps) {
  const headingId = `bench-${card.benchId}-heading`;
  const outCount = card.quantities.filter((q) => q.minutesOutOfWindow > 0).length;
  const { air } = card;
  return (
    <article
      id={`bench-${card.benchId}`}
      aria-labelledby={headingId}
      data-bench-id={card.benchId}
      data-checked={check.kind}
      className={`scroll-mt-60 flex flex-col gap-4 rounded-2xl border-2 bg-surface p-4 shadow-sm ${check.kind === "unchecked" ? "border-line" : "border-ok"}`}
    >
      <header className="flex flex-wrap items-start justify-between gap-2">
        <div>
          <p className="text-base font-semibold text-muted">
            Bench {place} of {total} · {card.zoneName}
          </p>
          <h3 id={headingId} className="text-3xl font-bold">
            {card.benchName}
          </h3>
          <p className="text-base">{describePeriod(card.period, timeZone)}</p>
        </div>
        <CheckPill check={check} timeZone={timeZone} />
      </header>

      {outCount > 0 && (
        <p className="rounded-lg bg-high px-3 py-2 text-lg font-bold text-on-status">
          {outCount === 1 ? "1 quantity was" : `${outCount} quantities were`} out of window in this time
        </p>
      )}

      <div className="grid gap-3 sm:grid-cols-2">
        {card.quantities.map((q) => (
          <QuantitySummary key={q.quantity} q={q} unit={unit} timeZone={timeZone} />
        ))}
      </div>

      <div role="group" aria-label="Dew point and VPD" className="grid gap-3 rounded-xl border-2 border-line p-3 sm:grid-cols-3">
        <div>
          <p className="text-sm font-semibold uppercase tracking-wide text-muted">Dew point</p>
          <p className="text-xl font-bold tabular-nums">{air.dewPointC ? `${formatDewPoint(air.dewPointC.min.value, unit)} – ${formatDewPoint(air.dewPointC.max.value, unit)}` : "—"}</p>
        </div>
        <div>
          <p className="text-sm font-semibold uppercase tracking-wide text-muted">VPD</p>
          <p className="text-xl font-bold tabular-nums">{air.vpdKPa ? `${formatVpd(air.vpdKPa.min.value)} – ${formatVpd(air.vpdKPa.max.value)}` : "—"}</p>
        </div>
        <div>
          <p className="text-sm font-semibold uppercase tracking-wide text-muted">Closest to dew point</p>
          <p className={`text-xl font-bold tabular-nums ${air.dewPointMarginC && air.dewPointMarginC.min.value <= air.dewPointMarginC.alertMarginC ? "text-high" : ""}`}>
            {air.dewPointMarginC ? `${formatTemperatureDelta(air.dewPointMarginC.min.value, unit)} above` : "—"}
          </p>
          {air.dewPointMarginC && <p className="text-sm text-muted">alert below {formatTemperatureDelta(air.dewPointMarginC.alertMarginC, unit)}</p>}
        </div>
      </div>

      <section aria-label={`Alerts on ${card.benchName} in this time`}>
        <h4 className="text-xl font-bold">Alerts</h4>
        {card.alerts.length === 0 ? (
          <p className="text-lg text-muted">None in this time.</p>
        ) : (
          <ul className="mt-1 flex flex-col gap-2">
            {card.alerts.map((alert) => (
              <li key={alert.id} className="flex flex-wrap items-center gap-2 rounded-lg border-2 border-line p-2">
                <PhasePill phase={alert.phase} />
                <span className="text-lg font-bold">{alert.summary}</span>
                <span className="text-base">
                  from {formatSiteTime(alert.sinceMs, timeZone)}
                  {alert.clearedAtMs ? ` to ${formatSiteTime(alert.clearedAtMs, timeZone)}` : ", still open"}
                  {alert.acknowledgedByName ? ` · taken by ${alert.acknowledgedByName}` : ""}
                </span>
              </li>
            ))}
          </ul>
        )}
      </section>

      <section aria-label={`Batches on ${card.benchName}`} className="flex flex-col gap-3">
        <h4 className="text-xl font-bold">Batches</h4>
        {card.batches.length === 0 ? <p className="text-lg text-muted">No open batch on this bench.</p> : batches}
      </section>

      {onCheck && check.kind === "unchecked" && (
        <Button variant="primary" onClick={onCheck} className="min-h-16 w-full text-xl">
          <span aria-hidden="true">✓</span> {card.benchName} checked
        </Button>
      )}
      {onUncheck && check.kind === "checked" && (
        <Button variant="quiet" onClick={onUncheck} isBusy={isUncheckBusy} className="self-start">
          Undo the check-off of {card.benchName}
        </Button>
      )}
    </article>
  );
}

function CheckPill({ check, timeZone }: { check: CheckState; timeZone: string }) {
  if (check.kind === "checked") {
    return (
      <span className="inline-flex items-center gap-1.5 rounded-full bg-ok-soft px-3 py-1 text-lg font-bold text-ok">
        <span aria-hidden="true">✓</span> Checked {formatSiteTime(check.atMs, timeZone, false)} by {check.by}
      </span>
    );
  }
  if (check.kind === "waiting") {
    return <span className="inline-flex items-center gap-1.5 rounded-full border-2 border-dashed border-high bg-high-soft px-3 py-1 text-lg font-bold text-ink">Checked · waiting to send</span>;
  }
  return <span className="inline-flex items-center rounded-full border-2 border-line px-3 py-1 text-lg font-semibold text-muted">Not checked yet</span>;
}
