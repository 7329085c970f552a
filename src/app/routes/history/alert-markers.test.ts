import { describe, expect, it } from "vitest";
import type { AlertView } from "../../../../shared/schemas/alerts.js";
import { alertMarkers } from "./alert-markers";

const alert = (over: Partial<AlertView>): AlertView => ({
  id: 1,
  kind: "window",
  phase: "raised",
  benchId: 2,
  benchName: "Bench 2",
  zoneId: 1,
  zoneName: "Propagation house",
  siteName: "Home nursery",
  quantity: "air.temperature",
  direction: "below",
  sensorId: null,
  lastValue: null,
  worstValue: null,
  windowMin: null,
  windowMax: null,
  sinceMs: 1_000,
  raisedAtMs: 2_000,
  acknowledgedAtMs: null,
  acknowledgedByName: null,
  acknowledgeNote: null,
  clearedAtMs: null,
  escalatedAtMs: null,
  summary: "Air too cold",
  ...over,
});

describe("alerts as history-chart marks", () => {
  it("a window alert is marked at its raising on its own quantity's chart only", () => {
    expect(alertMarkers([alert({})], { withBench: false })).toEqual({ "air.temperature": [{ timeMs: 2_000, label: "Air too cold" }] });
  });

  it("on a zone's charts the label names the bench", () => {
    const markers = alertMarkers([alert({ quantity: "medium.moisture", summary: "Medium too dry" })], { withBench: true });
    expect(markers).toEqual({ "medium.moisture": [{ timeMs: 2_000, label: "Bench 2 · Medium too dry" }] });
  });

  it("a condensation risk goes on the air temperature and humidity charts, a silent sensor on all four", () => {
    const condensation = alertMarkers([alert({ kind: "condensation", quantity: null, summary: "Condensation risk" })], { withBench: true });
    expect(Object.keys(condensation).sort()).toEqual(["air.humidity", "air.temperature"]);
    const silent = alertMarkers([alert({ kind: "sensor-silent", quantity: null, summary: "Sensor silent" })], { withBench: true });
    expect(Object.keys(silent).sort()).toEqual(["air.humidity", "air.temperature", "medium.moisture", "medium.temperature"]);
    expect(silent["medium.temperature"]).toEqual([{ timeMs: 2_000, label: "Bench 2 · Sensor silent" }]);
  });

  it("leaves out an alert still being watched (never raised)", () => {
    expect(alertMarkers([alert({ phase: "watching", raisedAtMs: null })], { withBench: true })).toEqual({});
  });
});
