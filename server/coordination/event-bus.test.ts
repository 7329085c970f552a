import { describe, expect, it } from "vitest";
import type { ReadingRow } from "../modules/readings/readings.repository.js";
import { decodeEvent, encodeEvent } from "./event-bus.js";

describe("cluster event encoding", () => {
  it("splits a large batch of readings into NOTIFY payloads under 8,000 bytes and puts them back together in order", () => {
    const rows: ReadingRow[] = Array.from({ length: 1000 }, (_, i) => ({
      sensorId: `house-2-bench-${i % 40}-probe-a`,
      benchId: i % 40,
      quantity: i % 2 ? "air.temperature" : "medium.moisture",
      timeMs: 1_796_329_492_887 + i * 1000,
      value: 21.123456789 + i / 7,
    }));
    const payloads = encodeEvent({ type: "readings", rows });
    expect(payloads.length).toBeGreaterThan(5);
    for (const p of payloads) expect(Buffer.byteLength(p)).toBeLessThan(8000);
    const back = payloads.flatMap((p) => {
      const event = decodeEvent(p);
      return event.type === "readings" ? event.rows : [];
    });
    expect(back).toEqual(rows);
  });

  it("sends other events whole", () => {
    expect(encodeEvent({ type: "alerts", alertIds: [3, 4] }).map(decodeEvent)).toEqual([{ type: "alerts", alertIds: [3, 4] }]);
    expect(encodeEvent({ type: "readings", rows: [] })).toEqual([]);
  });

  it("marks every payload with the sender's origin first (so it can drop its own echo) and decodes without it", () => {
    const rows: ReadingRow[] = Array.from({ length: 300 }, (_, i) => ({ sensorId: `probe-${i}`, benchId: i, quantity: "air.humidity", timeMs: 1_796_329_492_887 + i, value: i / 3 }));
    for (const event of [{ type: "windows" } as const, { type: "readings", rows } as const]) {
      const payloads = encodeEvent(event, "a1b2");
      for (const p of payloads) {
        expect(p.startsWith('{"o":"a1b2",')).toBe(true);
        expect(Buffer.byteLength(p)).toBeLessThan(8000);
      }
      const back = payloads.map(decodeEvent);
      expect(event.type === "readings" ? back.flatMap((e) => (e.type === "readings" ? e.rows : [])) : back).toEqual(event.type === "readings" ? rows : [event]);
    }
  });
});
