import { fireEvent, screen, waitFor, within } from "@testing-library/react";
import { beforeEach, describe, expect, it, vi } from "vitest";
import type { BenchReadingsResponse } from "../../../../shared/schemas/readings.js";
import { NOW_MS, USERS, WINDOWS, makeSession, makeZones } from "../../../testing/data";
import { createApiFake } from "../../../testing/fakes";
import { FIRST_PAINT, ROUTE_TEST_TIMEOUT_MS, renderApp } from "../../../testing/render-app";

const DAY_MS = 86_400_000;
const NOW = NOW_MS + 30_000;

function readings(fromMs: number, toMs: number): BenchReadingsResponse {
  return {
    bench: { id: 2, name: "Bench 2", zoneId: 1, zoneName: "Fig house" },
    fromMs,
    toMs,
    bucketMs: 300_000,
    windows: WINDOWS,
    series: [
      { quantity: "air.temperature", points: [{ timeMs: toMs - 600_000, min: 24, mean: 25, max: 26, count: 5 }] },
      { quantity: "air.humidity", points: [{ timeMs: toMs - 600_000, min: 79, mean: 80, max: 81, count: 5 }] },
    ],
  };
}

function benchApi() {
  return createApiFake({
    "GET /api/session": { body: makeSession(USERS.grower) },
    "GET /api/zones": { body: makeZones() },
    "GET /api/benches/2/readings": ({ search }) => {
      const q = new URLSearchParams(search);
      const toMs = q.has("to") ? Date.parse(q.get("to")!) : NOW;
      const fromMs = q.has("from") ? Date.parse(q.get("from")!) : toMs - DAY_MS;
      return { body: readings(fromMs, toMs) };
    },
  });
}

const readingsCalls = (api: ReturnType<typeof benchApi>) => api.sent("GET /api/benches/2/readings").map((r) => Object.fromEntries(new URLSearchParams(r.search)));

describe("bench history: range", () => {
  beforeEach(() => vi.setSystemTime(NOW));

  it(
    "24 h asks the server's default day; 7 d and 30 d ask from = now − 7 / 30 days to now; dates ask local midnight to the end of the last day",
    async () => {
      const api = benchApi();
      const { location } = renderApp("/benches/2", api);
      expect(await screen.findByRole("heading", { name: "Last 24 hours" }, FIRST_PAINT)).toBeTruthy();
      expect(readingsCalls(api)).toEqual([{}]);

      const range = screen.getByRole("group", { name: "Time range" });
      fireEvent.click(within(range).getByRole("button", { name: "7 d" }));
      expect(await screen.findByRole("heading", { name: "Last 7 days" })).toBeTruthy();
      expect(readingsCalls(api).at(-1)).toEqual({ from: new Date(NOW - 7 * DAY_MS).toISOString(), to: new Date(NOW).toISOString() });
      expect(location()).toBe("/benches/2?range=7d");

      fireEvent.click(within(screen.getByRole("group", { name: "Time range" })).getByRole("button", { name: "30 d" }));
      expect(await screen.findByRole("heading", { name: "Last 30 days" })).toBeTruthy();
      expect(readingsCalls(api).at(-1)).toEqual({ from: new Date(NOW - 30 * DAY_MS).toISOString(), to: new Date(NOW).toISOString() });

      fireEvent.click(within(screen.getByRole("group", { name: "Time range" })).getByRole("button", { name: "Dates" }));
      const form = screen.getByRole("form", { name: "Choose dates" });
      fireEvent.change(within(form).getByLabelText("First day"), { target: { value: "2025-01-10" } });
      fireEvent.change(within(form).getByLabelText("Last day"), { target: { value: "2025-01-08" } });
      fireEvent.click(within(form).getByRole("button", { name: "Show these days" }));
      expect(within(form).getByText("The last day cannot be before the first")).toBeTruthy();

      fireEvent.change(within(form).getByLabelText("Last day"), { target: { value: "2025-01-12" } });
      fireEvent.click(within(form).getByRole("button", { name: "Show these days" }));
      await waitFor(() => expect(location()).toBe("/benches/2?from=2025-01-10&to=2025-01-12"));
      await waitFor(() =>
        expect(readingsCalls(api).at(-1)).toEqual({ from: new Date(2025, 0, 10).toISOString(), to: new Date(2025, 0, 13).toISOString() }),
      );
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "the dew point and VPD are derived lines switched on by the reader, worked out with shared/domain/psychrometrics.ts",
    async () => {
      renderApp("/benches/2", benchApi());
      await screen.findByRole("heading", { name: "Last 24 hours" }, FIRST_PAINT);
      expect(screen.queryByRole("figure", { name: /Vapour-pressure deficit/ })).toBeNull();
      const dew = screen.getByRole("button", { name: "Dew point" });
      expect(dew.getAttribute("aria-pressed")).toBe("false");
      fireEvent.click(dew);
      expect(dew.getAttribute("aria-pressed")).toBe("true");
      expect(within(screen.getByRole("list", { name: "Chart key" })).getByText("Dew point")).toBeTruthy();

      fireEvent.click(screen.getByRole("button", { name: "VPD" }));
      const vpd = screen.getByRole("figure", { name: /Vapour-pressure deficit/ });
      // 25 °C at 80 % RH: e°(25) = 3.168 kPa (FAO-56 Annex 2), VPD = 3.168 × 0.2 = 0.63 kPa.
      expect(vpd.textContent).toContain("0.63 kPa");
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "exports the shown range as CSV: bench, from/to, a rolled-up interval for a week, the reader's °F; raw over 31 days is refused on the field",
    async () => {
      const api = benchApi();
      api.routes["GET /api/exports/readings.csv"] = { body: "time (UTC),air.temperature (°F)" };
      const createObjectURL = vi.fn(() => "blob:csv");
      // happy-dom makes no object URLs; a subclass stands in for the download (unstubbed after the test).
      vi.stubGlobal(
        "URL",
        class extends URL {
          static createObjectURL = createObjectURL;
          static revokeObjectURL = vi.fn();
        },
      );
      renderApp("/benches/2?range=7d", api);
      await screen.findByRole("heading", { name: "Last 7 days" }, FIRST_PAINT);
      fireEvent.click(screen.getByRole("button", { name: /Export CSV/ }));
      const dialog = screen.getByRole("dialog", { name: /Export CSV/ });
      expect((within(dialog).getByLabelText("Interval") as HTMLSelectElement).value).toBe("15m");
      fireEvent.click(within(dialog).getByRole("button", { name: "Download CSV" }));
      await waitFor(() => expect(api.sent("GET /api/exports/readings.csv")).toHaveLength(1));
      const query = new URLSearchParams(api.sent("GET /api/exports/readings.csv")[0]!.search);
      expect(Object.fromEntries([...query].filter(([k]) => k !== "from" && k !== "to"))).toEqual({ benchId: "2", interval: "15m", temperatureUnit: "F", moistureUnit: "percent" });
      // The dialog's fields hold whole minutes.
      expect(Math.abs(Date.parse(query.get("from")!) - (NOW - 7 * DAY_MS))).toBeLessThan(60_000);
      expect(Math.abs(Date.parse(query.get("to")!) - NOW)).toBeLessThan(60_000);
      await waitFor(() => expect(createObjectURL).toHaveBeenCalled());

      fireEvent.click(screen.getByRole("button", { name: /Export CSV/ }));
      const again = screen.getByRole("dialog", { name: /Export CSV/ });
      fireEvent.change(within(again).getByLabelText("From"), { target: { value: "2024-12-01T00:00" } });
      fireEvent.change(within(again).getByLabelText("Interval"), { target: { value: "raw" } });
      fireEvent.click(within(again).getByRole("button", { name: "Download CSV" }));
      expect(within(again).getByText(/Every reading is available for at most 31 days/)).toBeTruthy();
      expect(api.sent("GET /api/exports/readings.csv")).toHaveLength(1);
    },
    ROUTE_TEST_TIMEOUT_MS,
  );
});
