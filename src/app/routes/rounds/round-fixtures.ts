// Test data for the walk-through route tests only; nothing in the app imports this file.
import type { ObservationView } from "../../../../shared/schemas/batches.js";
import type { BenchCard, CardBatch, QuantityCard, RoundCardsResponse, RoundView } from "../../../../shared/schemas/rounds.js";
import { makeAlert, NOW_MS } from "../../../testing/data";

export const ROUND_ID = 7;
export const TZ = "America/Chicago";
const MIN = 60_000;

export function makeRound(overrides: Partial<RoundView> = {}): RoundView {
  return {
    id: ROUND_ID,
    siteId: 1,
    siteName: "Hillside nursery",
    timeZone: TZ,
    zoneId: 1,
    zoneName: "Fig house",
    scopeLabel: "Fig house",
    status: "in-progress",
    startedAtMs: NOW_MS - 20 * MIN,
    startedBy: { userId: 3, name: "Gil Grower" },
    finishedAtMs: null,
    finishedBy: null,
    benches: [
      { benchId: 1, benchName: "Bench 1", zoneId: 1, zoneName: "Fig house", order: 0, check: null },
      { benchId: 2, benchName: "Bench 2", zoneId: 1, zoneName: "Fig house", order: 1, check: null },
    ],
    benchCount: 2,
    checkedCount: 0,
    ...overrides,
  };
}

function quantity(q: QuantityCard["quantity"], overrides: Partial<QuantityCard> = {}): QuantityCard {
  return {
    quantity: q,
    window: null,
    min: null,
    max: null,
    readingCount: 0,
    minutes: { inside: 0, below: 0, above: 0, noData: 600 },
    minutesOutOfWindow: 0,
    insidePct: null,
    sampled: false,
    ...overrides,
  };
}

export function makeCardBatch(overrides: Partial<CardBatch> = {}): CardBatch {
  return {
    id: 11,
    variety: "Harbour Amber",
    stuckOn: "2024-12-26",
    ageDays: 20,
    countStuck: 60,
    stage: "stuck",
    tally: { stuck: 60, rooted: 4, lost: 2, pending: 54, strikeRate: 4 / 60, lossRate: 2 / 60, isFinal: false },
    lastObservation: null,
    observationsThisRound: [],
    ...overrides,
  };
}

/** Bench 1: a cold spell 19 °C (66.2 °F) for 8 min, up to 25 °C (77.0 °F); humidity 80 %; a cleared alert; one batch. */
export function makeCards(): BenchCard[] {
  const period = { fromMs: NOW_MS - 12 * 3600_000, toMs: NOW_MS, since: "evening-before" as const, sinceRoundId: null, capped: false };
  return [
    {
      roundId: ROUND_ID,
      benchId: 1,
      benchName: "Bench 1",
      zoneId: 1,
      zoneName: "Fig house",
      order: 0,
      period,
      quantities: [
        quantity("air.temperature", {
          window: { min: 21.1, max: 26.7 },
          min: { value: 19, timeMs: NOW_MS - 50 * MIN },
          max: { value: 25, timeMs: NOW_MS - 42 * MIN },
          readingCount: 30,
          minutes: { inside: 31, below: 8, above: 0, noData: 0 },
          minutesOutOfWindow: 8,
          insidePct: 79.5,
        }),
        quantity("air.humidity", { window: { min: 60, max: 90 }, min: { value: 80, timeMs: NOW_MS - 60 * MIN }, max: { value: 80, timeMs: NOW_MS - 60 * MIN }, readingCount: 30, minutes: { inside: 39, below: 0, above: 0, noData: 0 }, insidePct: 100 }),
        quantity("medium.temperature"),
        quantity("medium.moisture"),
      ],
      air: {
        pairCount: 30,
        dewPointC: { min: { value: 15.4, timeMs: NOW_MS - 50 * MIN }, max: { value: 21.3, timeMs: NOW_MS - 42 * MIN } },
        vpdKPa: { min: { value: 0.44, timeMs: NOW_MS - 50 * MIN }, max: { value: 0.63, timeMs: NOW_MS - 42 * MIN } },
        dewPointMarginC: { min: { value: 2, timeMs: NOW_MS - 50 * MIN }, alertMarginC: 2 },
      },
      alerts: [makeAlert({ id: 5, phase: "cleared", summary: "Air too cold", clearedAtMs: NOW_MS - 30 * MIN, acknowledgedByName: "Nadia Night" })],
      batches: [makeCardBatch()],
      check: null,
    },
    {
      roundId: ROUND_ID,
      benchId: 2,
      benchName: "Bench 2",
      zoneId: 1,
      zoneName: "Fig house",
      order: 1,
      period,
      quantities: [quantity("air.temperature"), quantity("air.humidity"), quantity("medium.temperature"), quantity("medium.moisture")],
      air: { pairCount: 0, dewPointC: null, vpdKPa: null, dewPointMarginC: null },
      alerts: [],
      batches: [],
      check: null,
    },
  ];
}

export function makeCardsResponse(cards: BenchCard[] = makeCards(), round: RoundView = makeRound()): RoundCardsResponse {
  return { round, cards };
}

/** The observation the server would store for a body sent to POST /api/batches/11/observations. */
export function storedObservation(id: number, body: Record<string, unknown>): ObservationView {
  return {
    id,
    clientId: String(body.clientId),
    batchId: 11,
    roundId: (body.roundId as number | null) ?? null,
    observedOn: String(body.observedOn ?? "2025-01-15"),
    stage: body.stage as ObservationView["stage"],
    rootedCount: (body.rootedCount as number | null) ?? null,
    lostCount: (body.lostCount as number | null) ?? null,
    flags: (body.flags as ObservationView["flags"]) ?? [],
    note: (body.note as string | null) ?? null,
    recordedAtMs: NOW_MS,
    recordedBy: { userId: 3, name: "Gil Grower" },
    updatedAtMs: NOW_MS,
    photos: [],
  };
}
