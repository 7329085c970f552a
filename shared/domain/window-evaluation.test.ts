import { describe, it, expect } from "vitest";
import fc from "fast-check";
import {
  acknowledgeAlert,
  clearingThresholds,
  evaluateSample,
  evaluateSeries,
  evaluateTick,
  initialWindowAlertState,
  isAlertOpen,
  isEscalationDue,
  isRenotificationDue,
  type EvaluationWindow,
  type WindowAlertState,
  type WindowSample,
  type WindowTransition,
} from "./window-evaluation.js";

// Air window for fig cuttings: 21–27 °C (70–80 °F, PRODUCT.md §1 and REFERENCES.md §6, common practice),
// 10-minute hold-off and a 0.5 °C hysteresis band (common practice).
const AIR: EvaluationWindow = { min: 21, max: 27, delayS: 600, hysteresis: 0.5 };
const MIN = 60_000;
const T0 = Date.UTC(2025, 2, 2, 2, 0, 0); // 02:00 on a March night

/** Samples one minute apart from T0. */
function everyMinute(values: number[], startMs = T0): WindowSample[] {
  return values.map((value, i) => ({ timeMs: startMs + i * MIN, value }));
}

function run(samples: WindowSample[], window = AIR, state = initialWindowAlertState()) {
  return evaluateSeries(state, window, samples);
}

const kinds = (transitions: WindowTransition[]) => transitions.map((t) => t.kind);

describe("window evaluation — the alert life-cycle of PRODUCT.md §3", () => {
  it("values inside the window never open anything; the limits themselves are inside", () => {
    const { state, transitions } = run(everyMinute([21, 22.4, 24, 27, 26.9]));
    expect(transitions).toEqual([]);
    expect(state.phase).toBe("idle");
    expect(state.lastValue).toBe(26.9);
  });

  it("an excursion shorter than the hold-off delay is dropped silently, never raised (PRODUCT.md §3)", () => {
    // 20.6 °C for 9 minutes (02:01–02:10 held), back to 21.4 at 02:10.
    const { state, transitions } = run(everyMinute([22, 20.6, 20.5, 20.6, 20.7, 20.8, 20.8, 20.9, 20.9, 20.9, 21.4]));
    expect(kinds(transitions)).toEqual(["watching", "dropped"]);
    expect(transitions[0]).toMatchObject({ atMs: T0 + MIN, direction: "below", value: 20.6 });
    expect(transitions[1]).toMatchObject({ atMs: T0 + 10 * MIN, sinceMs: T0 + MIN, worstValue: 20.5 });
    expect(state.phase).toBe("idle");
  });

  it("a heater failure raises once the value has been out for the full delay, at sinceMs + delay (PRODUCT.md §3)", () => {
    const cooling = [22, 20.8, 20.2, 19.6, 19.1, 18.7, 18.3, 18, 17.8, 17.6, 17.5, 17.4, 17.3];
    const { state, transitions } = run(everyMinute(cooling));
    expect(kinds(transitions)).toEqual(["watching", "raised"]);
    expect(transitions[1]).toMatchObject({ kind: "raised", atMs: T0 + MIN + 600_000, sinceMs: T0 + MIN, direction: "below", value: 17.4 });
    expect(state).toMatchObject({ phase: "raised", direction: "below", sinceMs: T0 + MIN, raisedAtMs: T0 + 11 * MIN, worstValue: 17.3 });
    expect(isAlertOpen(state)).toBe(true);
  });

  it("clearing needs the value back inside by the hysteresis band, so a value wobbling on the edge does not flap (issue 3 item 4)", () => {
    const raised = run(everyMinute(Array.from({ length: 12 }, () => 19.5))).state;
    // Wobbling around min = 21: 20.9 / 21.1 / 20.95 / 21.3 / 21.49 — never past 21.5.
    const wobble = run(everyMinute([20.9, 21.1, 20.95, 21.3, 21.49, 20.99], T0 + 20 * MIN), AIR, raised);
    expect(wobble.transitions).toEqual([]);
    expect(wobble.state.phase).toBe("raised");
    const back = run(everyMinute([21.5], T0 + 30 * MIN), AIR, wobble.state);
    expect(kinds(back.transitions)).toEqual(["cleared"]);
    expect(back.transitions[0]).toMatchObject({ atMs: T0 + 30 * MIN, value: 21.5, worstValue: 19.5, sinceMs: T0 });
    expect(back.state).toEqual({ ...initialWindowAlertState(), lastValue: 21.5, lastSampleMs: T0 + 30 * MIN });
  });

  it("the same for a hot bench: an 'above' alert clears at max − hysteresis", () => {
    const hot = run(everyMinute([28, 28.5, 29, 29, 29, 29, 29, 29, 29, 29, 29, 26.7, 26.5]));
    expect(kinds(hot.transitions)).toEqual(["watching", "raised", "cleared"]);
    expect(hot.transitions[2]).toMatchObject({ value: 26.5, direction: "above", worstValue: 29 });
  });

  it("acknowledge: raised → acknowledged; stays open until it clears (PRODUCT.md §3, §5 night shift)", () => {
    const raised = run(everyMinute(Array.from({ length: 12 }, () => 19.5))).state;
    const acked = acknowledgeAlert(raised, T0 + 15 * MIN, "night-shift-ines");
    if (!acked.ok) throw new Error(acked.reason);
    expect(acked.transition).toMatchObject({ kind: "acknowledged", atMs: T0 + 15 * MIN, by: "night-shift-ines", value: 19.5 });
    expect(acked.state).toMatchObject({ phase: "acknowledged", acknowledgedAtMs: T0 + 15 * MIN, acknowledgedBy: "night-shift-ines" });
    expect(isAlertOpen(acked.state)).toBe(true);

    const again = acknowledgeAlert(acked.state, T0 + 16 * MIN, "someone-else");
    expect(again).toEqual({ ok: false, state: acked.state, reason: "already-acknowledged" });

    const colder = run(everyMinute([18.9, 21.2], T0 + 20 * MIN), AIR, acked.state);
    expect(colder.transitions).toEqual([]);
    expect(colder.state).toMatchObject({ phase: "acknowledged", worstValue: 18.9 });

    const cleared = run(everyMinute([22], T0 + 40 * MIN), AIR, colder.state);
    expect(kinds(cleared.transitions)).toEqual(["cleared"]);
    expect(cleared.state.acknowledgedBy).toBeNull();
  });

  it("acknowledge refuses what is not raised", () => {
    expect(acknowledgeAlert(initialWindowAlertState(), T0).ok).toBe(false);
    const idle = acknowledgeAlert(initialWindowAlertState(), T0);
    expect(!idle.ok && idle.reason).toBe("no-open-alert");
    const watching = run(everyMinute([20])).state;
    const refused = acknowledgeAlert(watching, T0 + MIN);
    expect(!refused.ok && refused.reason).toBe("not-yet-raised");
  });

  it("a timer tick raises an excursion with no new sample (report-by-exception probes)", () => {
    const watching = run(everyMinute([22, 19.8])).state;
    expect(evaluateTick(watching, AIR, T0 + 5 * MIN).transitions).toEqual([]);
    const tick = evaluateTick(watching, AIR, T0 + 30 * MIN);
    expect(kinds(tick.transitions)).toEqual(["raised"]);
    expect(tick.transitions[0]).toMatchObject({ atMs: T0 + MIN + 600_000, value: 19.8 });
    expect(tick.state.lastSampleMs).toBe(T0 + MIN); // a tick is not a sample
  });

  it("no data never clears or drops: ticks for hours leave a raised alert raised (issue 3 item 5: no data ≠ inside)", () => {
    let state = run(everyMinute(Array.from({ length: 12 }, () => 19))).state;
    for (let h = 1; h <= 6; h++) {
      const tick = evaluateTick(state, AIR, T0 + h * 3_600_000, { staleAfterMs: 5 * MIN });
      expect(tick.transitions).toEqual([]);
      state = tick.state;
    }
    expect(state.phase).toBe("raised");
  });

  it("with staleAfterMs, an excursion whose only evidence is stale raises at the next sample still out", () => {
    const options = { staleAfterMs: 5 * MIN };
    const watching = evaluateSeries(initialWindowAlertState(), AIR, everyMinute([20]), options).state;
    expect(evaluateTick(watching, AIR, T0 + 20 * MIN, options).transitions).toEqual([]);
    const next = evaluateSample(watching, AIR, { timeMs: T0 + 25 * MIN, value: 20.2 }, options);
    expect(kinds(next.transitions)).toEqual(["raised"]);
    expect(next.transitions[0]).toMatchObject({ atMs: T0 + 25 * MIN, sinceMs: T0 });
  });

  it("a delay of 0 raises with the first sample out", () => {
    const { transitions } = run(everyMinute([22, 20.9]), { ...AIR, delayS: 0 });
    expect(transitions.map((t) => [t.kind, t.atMs])).toEqual([
      ["watching", T0 + MIN],
      ["raised", T0 + MIN],
    ]);
  });

  it("a value that jumps across the window clears the old alert and starts watching the other side", () => {
    const raised = run(everyMinute(Array.from({ length: 12 }, () => 19))).state;
    const jump = evaluateSample(raised, AIR, { timeMs: T0 + 20 * MIN, value: 28 });
    expect(jump.transitions.map((t) => [t.kind, t.direction])).toEqual([
      ["cleared", "below"],
      ["watching", "above"],
    ]);
    expect(jump.state).toMatchObject({ phase: "watching", direction: "above", sinceMs: T0 + 20 * MIN });
  });

  it("a watching excursion that flips side is dropped and restarted on the other side", () => {
    const { transitions, state } = run(everyMinute([20, 28]));
    expect(transitions.map((t) => [t.kind, t.direction])).toEqual([
      ["watching", "below"],
      ["dropped", "below"],
      ["watching", "above"],
    ]);
    expect(state.sinceMs).toBe(T0 + MIN);
  });

  it("older samples and non-finite values are ignored; a re-sent sample changes nothing", () => {
    const state = run(everyMinute([22, 20])).state;
    expect(evaluateSample(state, AIR, { timeMs: T0, value: 30 })).toEqual({ state, transitions: [], ignored: "older-than-last-sample" });
    expect(evaluateSample(state, AIR, { timeMs: T0 + 2 * MIN, value: Number.NaN }).ignored).toBe("not-finite");
    expect(evaluateSample(state, AIR, { timeMs: T0 + MIN, value: 20 })).toEqual({ state, transitions: [] });
  });

  it("a changed window takes effect on the next tick (PRODUCT.md §5: changes take effect on the next evaluation)", () => {
    const watching = run(everyMinute([22, 20.5])).state;
    const lowered = { ...AIR, min: 20 };
    const tick = evaluateTick(watching, lowered, T0 + 3 * MIN);
    expect(kinds(tick.transitions)).toEqual(["dropped"]);
    expect(tick.state.phase).toBe("idle");
    const raisedAgain = evaluateTick(tick.state, AIR, T0 + 4 * MIN);
    expect(kinds(raisedAgain.transitions)).toEqual(["watching"]);
    expect(raisedAgain.state.sinceMs).toBe(T0 + 4 * MIN);
  });

  it("the hysteresis band is capped at half the window width", () => {
    expect(clearingThresholds(AIR)).toEqual({ below: 21.5, above: 26.5 });
    expect(clearingThresholds({ min: 0.35, max: 0.55, hysteresis: 0.5 })).toEqual({ below: 0.45, above: 0.45 });
  });

  it("escalation and re-notification are due only for a raised, unacknowledged alert (PRODUCT.md §5)", () => {
    const raised = run(everyMinute(Array.from({ length: 12 }, () => 19))).state;
    const raisedAtMs = raised.raisedAtMs as number;
    expect(isEscalationDue(raised, raisedAtMs + 14 * MIN, 15 * MIN)).toBe(false);
    expect(isEscalationDue(raised, raisedAtMs + 15 * MIN, 15 * MIN)).toBe(true);
    expect(isRenotificationDue(raised, raisedAtMs, raisedAtMs + 30 * MIN, 30 * MIN)).toBe(true);
    const acked = acknowledgeAlert(raised, raisedAtMs + MIN);
    if (!acked.ok) throw new Error("not acknowledged");
    expect(isEscalationDue(acked.state, raisedAtMs + 60 * MIN, 15 * MIN)).toBe(false);
    expect(isRenotificationDue(acked.state, raisedAtMs, raisedAtMs + 60 * MIN, 30 * MIN)).toBe(false);
  });

  it("the state survives a JSON round trip (it is persisted in the database, PRODUCT.md §2 scale path)", () => {
    const { state } = run(everyMinute([22, 19, 19, 19]));
    const restored = JSON.parse(JSON.stringify(state)) as WindowAlertState;
    expect(restored).toEqual(state);
    const samples = everyMinute(Array.from({ length: 12 }, () => 18.5), T0 + 4 * MIN);
    expect(run(samples, AIR, restored)).toEqual(run(samples, AIR, state));
  });
});

// ---------------------------------------------------------------------------------------------
// Properties (issue 3 item 7)

const windowArb: fc.Arbitrary<EvaluationWindow> = fc
  .record({
    min: fc.integer({ min: 15, max: 22 }),
    width: fc.integer({ min: 2, max: 10 }),
    delayS: fc.integer({ min: 0, max: 1800 }),
    hysteresis: fc.constantFrom(0, 0.25, 0.5, 1, 3),
  })
  .map(({ min, width, delayS, hysteresis }) => ({ min, max: min + width, delayS, hysteresis }));

/** A time-ordered series with irregular gaps (0 s … 20 min, repeats allowed) and values around the window. */
const seriesArb: fc.Arbitrary<WindowSample[]> = fc
  .array(fc.tuple(fc.integer({ min: 0, max: 1200 }), fc.double({ min: 10, max: 36, noNaN: true })), { maxLength: 60 })
  .map((steps) => {
    let timeMs = T0;
    return steps.map(([gapS, value]) => {
      timeMs += gapS * 1000;
      return { timeMs, value };
    });
  });

const staleArb = fc.constantFrom(undefined, 0, 5 * MIN, 30 * MIN);

function foldOneByOne(window: EvaluationWindow, samples: WindowSample[], staleAfterMs?: number) {
  const options = staleAfterMs === undefined ? {} : { staleAfterMs };
  let state = initialWindowAlertState();
  const transitions: WindowTransition[] = [];
  for (const sample of samples) {
    const result = evaluateSample(state, window, sample, options);
    state = result.state;
    transitions.push(...result.transitions);
  }
  return { state, transitions };
}

describe("window evaluation properties (fast-check; issue 3 item 7)", () => {
  it("evaluation is independent of how a series is split into batches", () => {
    fc.assert(
      fc.property(windowArb, seriesArb, fc.array(fc.nat(), { maxLength: 5 }), staleArb, (window, samples, cuts, staleAfterMs) => {
        const options = staleAfterMs === undefined ? {} : { staleAfterMs };
        const points = [...new Set(cuts.map((c) => c % (samples.length + 1)))].sort((a, b) => a - b);
        let state = initialWindowAlertState();
        const transitions: WindowTransition[] = [];
        let from = 0;
        for (const to of [...points, samples.length]) {
          const result = evaluateSeries(state, window, samples.slice(from, to), options);
          state = result.state;
          transitions.push(...result.transitions);
          from = to;
        }
        const whole = evaluateSeries(initialWindowAlertState(), window, samples, options);
        expect(state).toEqual(whole.state);
        expect(transitions).toEqual(whole.transitions);
        expect(whole).toEqual(foldOneByOne(window, samples, staleAfterMs));
      }),
    );
  });

  it("timer ticks between samples change nothing that samples alone decide (same window)", () => {
    fc.assert(
      fc.property(windowArb, seriesArb, fc.array(fc.double({ min: 0, max: 1, noNaN: true }), { maxLength: 60 }), staleArb, (window, samples, fractions, staleAfterMs) => {
        const options = staleAfterMs === undefined ? {} : { staleAfterMs };
        let state = initialWindowAlertState();
        const transitions: WindowTransition[] = [];
        samples.forEach((sample, i) => {
          const result = evaluateSample(state, window, sample, options);
          state = result.state;
          transitions.push(...result.transitions);
          const next = samples[i + 1];
          const fraction = fractions[i];
          if (next !== undefined && fraction !== undefined) {
            const tick = evaluateTick(state, window, sample.timeMs + fraction * (next.timeMs - sample.timeMs), options);
            state = tick.state;
            transitions.push(...tick.transitions);
          }
        });
        const samplesOnly = foldOneByOne(window, samples, staleAfterMs);
        expect(transitions).toEqual(samplesOnly.transitions);
        expect(state).toEqual(samplesOnly.state);
      }),
    );
  });

  it("an excursion shorter than the delay never raises (PRODUCT.md §3)", () => {
    // Inside samples, interrupted by bursts out of window that are back inside before the delay ends.
    const burst = fc.record({
      insideGapS: fc.integer({ min: 1, max: 3600 }),
      outValues: fc.array(fc.oneof(fc.double({ min: 10, max: 20.99, noNaN: true }), fc.double({ min: 27.01, max: 36, noNaN: true })), {
        minLength: 1,
        maxLength: 5,
      }),
      spanFraction: fc.double({ min: 0, max: 0.999, noNaN: true }),
    });
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 3600 }), fc.array(burst, { maxLength: 10 }), (delayS, bursts) => {
        const window = { ...AIR, delayS };
        const samples: WindowSample[] = [];
        let timeMs = T0;
        for (const b of bursts) {
          timeMs += b.insideGapS * 1000;
          samples.push({ timeMs, value: 24 });
          const spanMs = Math.floor(b.spanFraction * delayS * 1000);
          const stepMs = Math.floor(spanMs / b.outValues.length);
          b.outValues.forEach((value, i) => samples.push({ timeMs: timeMs + 1 + i * stepMs, value }));
          timeMs += 1 + spanMs;
          samples.push({ timeMs, value: 24 }); // back inside before sinceMs + delay
        }
        const { transitions } = evaluateSeries(initialWindowAlertState(), window, samples);
        expect(transitions.some((t) => t.kind === "raised")).toBe(false);
      }),
    );
  });

  it("the life-cycle is well formed: raised only after the delay with every sample out, cleared only past the band", () => {
    fc.assert(
      fc.property(windowArb, seriesArb, (window, samples) => {
        const { transitions } = evaluateSeries(initialWindowAlertState(), window, samples);
        const thresholds = clearingThresholds(window);
        let phase: "idle" | "watching" | "open" = "idle";
        for (const t of transitions) {
          if (t.kind === "watching") {
            expect(phase).toBe("idle");
            phase = "watching";
          } else if (t.kind === "dropped") {
            expect(phase).toBe("watching");
            expect(t.atMs - t.sinceMs).toBeLessThanOrEqual(window.delayS * 1000);
            phase = "idle";
          } else if (t.kind === "raised") {
            expect(phase).toBe("watching");
            expect(t.atMs - t.sinceMs).toBe(window.delayS * 1000); // held values, no staleness limit
            const during = samples.filter((s) => s.timeMs > t.sinceMs && s.timeMs <= t.atMs);
            for (const s of during) expect(t.direction === "below" ? s.value < window.min : s.value > window.max).toBe(true);
            phase = "open";
          } else if (t.kind === "cleared") {
            expect(phase).toBe("open");
            expect(t.direction === "below" ? t.value >= thresholds.below : t.value <= thresholds.above).toBe(true);
            phase = "idle";
          }
        }
      }),
    );
  });
});
