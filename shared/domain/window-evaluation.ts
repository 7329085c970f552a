/**
 * Rooting-window evaluation: the alert life-cycle of one quantity on one bench (PRODUCT.md §3).
 *
 *   idle ──out──▶ watching ──held out for delayS──▶ raised ──acknowledge──▶ acknowledged
 *                    │                                 │                        │
 *                    └─back inside: dropped silently   └──back inside past the hysteresis band: cleared ──▶ idle
 *
 * Pure and deterministic: the caller passes the state in and stores the state that comes out
 * (it is plain JSON with nulls, one row per bench and quantity), together with explicit times.
 *
 * Time model (sample-and-hold): a sample's value stands from its time until the next sample, or
 * for at most `staleAfterMs` (default: no limit). An excursion raises at `sinceMs + delayS`,
 * the moment the hold-off ran out, provided the value was known to be still out then; otherwise
 * at the first later sample that is still out. An excursion back inside at or before that moment
 * is dropped. So the states and transitions do not depend on how a series is cut into batches,
 * nor on how often the timer ticks.
 * No data never clears or drops anything: only a sample (or the held value under a changed
 * window) can.
 */
import type { QuantityWindow } from "../schemas/windows.js";
import { classifyValue } from "./window-status.js";

/** Which side of the window an excursion is on: "below" = too cold / too dry, "above" = too hot / too wet. */
export type AlertDirection = "below" | "above";

/** "idle" = no excursion under way; the other three are the life-cycle names of PRODUCT.md §3. */
export type AlertPhase = "idle" | "watching" | "raised" | "acknowledged";

/** The persisted evaluation state of one quantity on one bench. Times in ms since 1970 (UTC). */
export interface WindowAlertState {
  phase: AlertPhase;
  /** Side of the current excursion; null when idle. */
  direction: AlertDirection | null;
  /** When the value was first seen out of the window in this excursion; null when idle. */
  sinceMs: number | null;
  /** When the hold-off ran out (see the time model above); null unless raised or acknowledged. */
  raisedAtMs: number | null;
  acknowledgedAtMs: number | null;
  /** Who acknowledged (a user id or name, as the caller chooses). */
  acknowledgedBy: string | null;
  /** The value furthest from the window in this excursion (lowest when below, highest when above). */
  worstValue: number | null;
  /** The newest sample's value and time; kept while idle (a tick re-applies it, older samples are ignored). */
  lastValue: number | null;
  lastSampleMs: number | null;
}

/** The parts of a quantity window evaluation uses (stored units; delay in seconds). */
export type EvaluationWindow = Pick<QuantityWindow, "min" | "max" | "delayS" | "hysteresis">;

export type WindowTransitionKind = "watching" | "raised" | "acknowledged" | "cleared" | "dropped";

/**
 * One step of the life-cycle. Notify on "raised" (and "cleared" for the all-clear); "watching"
 * and "dropped" are for logs and the dashboard only — a dropped excursion is never notified.
 */
export interface WindowTransition {
  kind: WindowTransitionKind;
  atMs: number;
  direction: AlertDirection;
  /** Start of the excursion this transition belongs to. */
  sinceMs: number;
  /** The value at that moment (for "raised" and "acknowledged", the held value). */
  value: number;
  worstValue: number;
  /** Who acknowledged; only on "acknowledged". */
  by?: string | null;
}

export interface WindowEvaluationOptions {
  /**
   * How long one sample's value may stand in for the truth, ms. Default Infinity: the last value
   * stands until the next sample (right for report-by-exception probes; a silent sensor has an
   * alert of its own). With a finite value, an excursion whose only evidence is older than this
   * does not raise until a newer sample shows it still out.
   */
  staleAfterMs?: number;
}

export interface WindowEvaluationResult {
  state: WindowAlertState;
  /** In time order; empty when nothing changed. */
  transitions: WindowTransition[];
  /** Set when a sample was ignored: older than the last one, or not a finite number. */
  ignored?: "older-than-last-sample" | "not-finite";
}

export interface WindowSample {
  timeMs: number;
  value: number;
}

/** The state of a bench quantity that has never been evaluated. */
export function initialWindowAlertState(): WindowAlertState {
  return {
    phase: "idle",
    direction: null,
    sinceMs: null,
    raisedAtMs: null,
    acknowledgedAtMs: null,
    acknowledgedBy: null,
    worstValue: null,
    lastValue: null,
    lastSampleMs: null,
  };
}

/** True while an alert is raised or acknowledged (watching is not yet an alert). */
export function isAlertOpen(state: WindowAlertState): boolean {
  return state.phase === "raised" || state.phase === "acknowledged";
}

/**
 * The values an open alert must come back past to clear: `min + h` for "below", `max − h` for
 * "above". The band is capped at half the window width, so the middle of the window always clears.
 */
export function clearingThresholds(window: Pick<QuantityWindow, "min" | "max" | "hysteresis">): { below: number; above: number } {
  const band = Math.max(0, Math.min(window.hysteresis, (window.max - window.min) / 2));
  return { below: window.min + band, above: window.max - band };
}

function isPastClearing(window: EvaluationWindow, direction: AlertDirection, value: number): boolean {
  const thresholds = clearingThresholds(window);
  return direction === "below" ? value >= thresholds.below : value <= thresholds.above;
}

function worse(direction: AlertDirection, a: number, b: number): number {
  return direction === "below" ? Math.min(a, b) : Math.max(a, b);
}

function toIdle(state: WindowAlertState): WindowAlertState {
  return {
    ...state,
    phase: "idle",
    direction: null,
    sinceMs: null,
    raisedAtMs: null,
    acknowledgedAtMs: null,
    acknowledgedBy: null,
    worstValue: null,
  };
}

function transition(state: WindowAlertState, kind: WindowTransitionKind, atMs: number, value: number): WindowTransition {
  return {
    kind,
    atMs,
    direction: state.direction as AlertDirection,
    sinceMs: state.sinceMs as number,
    value,
    worstValue: state.worstValue as number,
  };
}

/**
 * Raises a watching excursion whose hold-off has run out by `toMs` while its value was known.
 * Before a value is applied at `toMs` (and on ticks) the held value must still stand after the
 * due time (`due < toMs`); after a sample is applied at `toMs`, that sample itself may show the
 * value still out at the due time (`due <= toMs`). So a sample back inside exactly at the due time
 * drops the excursion, whether or not a tick came at that same instant.
 */
function advance(
  state: WindowAlertState,
  window: EvaluationWindow,
  toMs: number,
  staleAfterMs: number,
  out: WindowTransition[],
  includeToMs: boolean,
): WindowAlertState {
  if (state.phase !== "watching" || state.sinceMs === null || state.lastSampleMs === null || state.lastValue === null) return state;
  const dueMs = state.sinceMs + window.delayS * 1000;
  const knownUntilMs = Math.min(toMs, state.lastSampleMs + staleAfterMs);
  if (includeToMs ? dueMs > knownUntilMs : dueMs >= knownUntilMs) return state;
  const raisedAtMs = Math.max(dueMs, state.lastSampleMs);
  const raised: WindowAlertState = { ...state, phase: "raised", raisedAtMs };
  out.push(transition(raised, "raised", raisedAtMs, state.lastValue));
  return raised;
}

/** Applies a value (a new sample, or the held one under a tick) at `atMs`. */
function apply(state: WindowAlertState, window: EvaluationWindow, atMs: number, value: number, out: WindowTransition[]): WindowAlertState {
  const status = classifyValue(value, window);
  const outside: AlertDirection | null = status === "below" || status === "above" ? status : null;
  let next = state;

  if (next.phase === "watching") {
    const direction = next.direction as AlertDirection;
    if (outside === direction) return { ...next, worstValue: worse(direction, next.worstValue as number, value) };
    out.push(transition(next, "dropped", atMs, value));
    next = toIdle(next);
  } else if (next.phase === "raised" || next.phase === "acknowledged") {
    const direction = next.direction as AlertDirection;
    if (!isPastClearing(window, direction, value)) {
      // Still out, or back inside but within the hysteresis band: the alert stays open.
      return outside === direction ? { ...next, worstValue: worse(direction, next.worstValue as number, value) } : next;
    }
    out.push(transition(next, "cleared", atMs, value));
    next = toIdle(next);
  }

  if (outside !== null) {
    next = { ...next, phase: "watching", direction: outside, sinceMs: atMs, worstValue: value };
    out.push(transition(next, "watching", atMs, value));
  }
  return next;
}

/**
 * One sample in. `sample.timeMs` is the reading's own time (ms since 1970), not the time it arrived;
 * `sample.value` is in stored units. A sample older than the last one, or not finite, is ignored
 * (state unchanged, `ignored` set); one at the same time as the last is applied (re-sent readings are
 * harmless). First raises a watching excursion whose hold-off ran out before this sample, then
 * applies the value: out → watching (raised at once when delayS is 0); a watching excursion back
 * inside → dropped; an open alert back past the hysteresis band → cleared (and, when the value is
 * out on the other side, a new excursion starts).
 */
export function evaluateSample(
  state: WindowAlertState,
  window: EvaluationWindow,
  sample: WindowSample,
  options: WindowEvaluationOptions = {},
): WindowEvaluationResult {
  if (!Number.isFinite(sample.value) || !Number.isFinite(sample.timeMs)) return { state, transitions: [], ignored: "not-finite" };
  if (state.lastSampleMs !== null && sample.timeMs < state.lastSampleMs) {
    return { state, transitions: [], ignored: "older-than-last-sample" };
  }
  const staleAfterMs = options.staleAfterMs ?? Number.POSITIVE_INFINITY;
  const transitions: WindowTransition[] = [];
  let next = advance(state, window, sample.timeMs, staleAfterMs, transitions, false);
  next = apply(next, window, sample.timeMs, sample.value, transitions);
  next = { ...next, lastValue: sample.value, lastSampleMs: sample.timeMs };
  next = advance(next, window, sample.timeMs, staleAfterMs, transitions, true);
  return { state: next, transitions };
}

/**
 * A timer tick with no sample: `nowMs` is the evaluator's clock (ms since 1970). Raises a watching
 * excursion whose hold-off has run out, and re-applies the last value (while not stale) against
 * `window`, so a changed window takes effect without waiting for the next sample. With an unchanged
 * window, ticks never alter what samples alone would give. A tick before the last sample is
 * treated as a tick at the last sample.
 */
export function evaluateTick(
  state: WindowAlertState,
  window: EvaluationWindow,
  nowMs: number,
  options: WindowEvaluationOptions = {},
): WindowEvaluationResult {
  if (state.lastSampleMs === null || state.lastValue === null || !Number.isFinite(nowMs)) return { state, transitions: [] };
  const atMs = Math.max(nowMs, state.lastSampleMs);
  const staleAfterMs = options.staleAfterMs ?? Number.POSITIVE_INFINITY;
  const transitions: WindowTransition[] = [];
  let next = advance(state, window, atMs, staleAfterMs, transitions, false);
  if (atMs < state.lastSampleMs + staleAfterMs) {
    const sinceBefore = next.sinceMs;
    next = apply(next, window, atMs, state.lastValue, transitions);
    // Only an excursion the re-applied value has just started (a changed window) may raise at atMs.
    if (next.sinceMs !== sinceBefore) next = advance(next, window, atMs, staleAfterMs, transitions, true);
  }
  return { state: next, transitions };
}

/**
 * A batch of samples in: they are sorted by time (stably) and applied one by one, so a series in
 * time order gives the same state and transitions however it is cut into batches.
 */
export function evaluateSeries(
  state: WindowAlertState,
  window: EvaluationWindow,
  samples: readonly WindowSample[],
  options: WindowEvaluationOptions = {},
): WindowEvaluationResult {
  const ordered = [...samples].sort((a, b) => a.timeMs - b.timeMs);
  const transitions: WindowTransition[] = [];
  let next = state;
  for (const sample of ordered) {
    const result = evaluateSample(next, window, sample, options);
    next = result.state;
    transitions.push(...result.transitions);
  }
  return { state: next, transitions };
}

export type AcknowledgeResult =
  | { ok: true; state: WindowAlertState; transition: WindowTransition }
  | { ok: false; state: WindowAlertState; reason: "no-open-alert" | "not-yet-raised" | "already-acknowledged" };

/**
 * Someone has taken the alert (`atMs` = when they tapped, ms since 1970; `by` = who). Only a raised
 * alert can be acknowledged; otherwise the state is returned unchanged with the reason. Re-notification
 * stops, the alert stays open until it clears.
 */
export function acknowledgeAlert(state: WindowAlertState, atMs: number, by: string | null = null): AcknowledgeResult {
  if (state.phase === "idle") return { ok: false, state, reason: "no-open-alert" };
  if (state.phase === "watching") return { ok: false, state, reason: "not-yet-raised" };
  if (state.phase === "acknowledged") return { ok: false, state, reason: "already-acknowledged" };
  const next: WindowAlertState = { ...state, phase: "acknowledged", acknowledgedAtMs: atMs, acknowledgedBy: by };
  return { ok: true, state: next, transition: { ...transition(next, "acknowledged", atMs, state.lastValue as number), by } };
}

/** A raised (unacknowledged) alert older than `escalateAfterMs` at `nowMs`: time to mail the manager. */
export function isEscalationDue(state: WindowAlertState, nowMs: number, escalateAfterMs: number): boolean {
  return state.phase === "raised" && state.raisedAtMs !== null && nowMs - state.raisedAtMs >= escalateAfterMs;
}

/** A raised (unacknowledged) alert last notified at `lastNotifiedMs` is due again at `nowMs` after `intervalMs`. */
export function isRenotificationDue(state: WindowAlertState, lastNotifiedMs: number, nowMs: number, intervalMs: number): boolean {
  return state.phase === "raised" && nowMs - lastNotifiedMs >= intervalMs;
}
