import { fireEvent, screen, waitFor, within } from "@testing-library/react";
import { beforeEach, describe, expect, it, vi } from "vitest";
import type { Role } from "../../../../shared/schemas/auth.js";
import type { BenchWindowsInput } from "../../../../shared/schemas/windows.js";
import { NOW_MS, USERS, makeSession, makeZones } from "../../../testing/data";
import { createApiFake } from "../../../testing/fakes";
import { FIRST_PAINT, ROUTE_TEST_TIMEOUT_MS, renderApp } from "../../../testing/render-app";
import { LAYOUT, PRESETS, auditPage, benchWindows } from "./settings-fixtures";

function benchApi(role: Role = "manager") {
  return createApiFake({
    "GET /api/session": { body: makeSession(USERS[role]) },
    "GET /api/zones": { body: makeZones() },
    "GET /api/layout": { body: LAYOUT },
    "GET /api/window-presets": { body: { presets: PRESETS } },
    "GET /api/benches/2/windows": { body: benchWindows() },
    "GET /api/audit": { body: auditPage() },
    "GET /api/benches/2/assignments": {
      body: { assignments: [{ id: 1, sensorId: "probe-2", benchId: 2, benchName: "Bench 2", zoneId: 1, zoneName: "Fig house", fromMs: NOW_MS - 86_400_000, toMs: null }] },
    },
    "PUT /api/benches/2/windows": ({ search, body }) => {
      const input = body as BenchWindowsInput;
      return { body: { ...benchWindows(input.windows[0] ?? null), dryRun: search.includes("dryRun=true"), changed: true } };
    },
  });
}

async function openBench(api: ReturnType<typeof benchApi>) {
  renderApp("/settings/benches/2", api);
  await screen.findByRole("heading", { level: 1, name: "Bench 2" }, FIRST_PAINT);
}

describe("bench settings: overrides of the zone's windows", () => {
  beforeEach(() => vi.setSystemTime(NOW_MS + 30_000));

  it(
    "marks the bench's own air window where it differs from the zone (minimum 66.2 °F against the zone's 69.8 °F), and the rest as following the zone",
    async () => {
      await openBench(benchApi());
      const air = document.querySelector<HTMLElement>('[data-source="bench"][data-quantity="air.temperature"]')!;
      expect(air.textContent).toContain("Own window");
      expect(air.textContent).toContain("Air temperature: differs from the zone in minimum");
      const min = within(air).getByLabelText(/^Minimum \(°F\)/) as HTMLInputElement;
      expect(min.value).toBe("66.2");
      expect(min.dataset.differs).toBe("true");
      expect(within(air).getByText(/zone: 69\.8 °F/)).toBeTruthy();
      expect((within(air).getByLabelText(/^Maximum \(°F\)/) as HTMLInputElement).dataset.differs).toBe("false");

      expect((await screen.findByRole("row", { name: /probe-2/ })).textContent).toContain("Still here");

      const humidity = document.querySelector<HTMLElement>('[data-quantity="air.humidity"]')!;
      expect(humidity.getAttribute("data-source")).toBe("zone");
      expect(humidity.textContent).toContain("Follows the zone");
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "“Go back to the zone's window” drops the override: the save sends no air window",
    async () => {
      const api = benchApi();
      await openBench(api);
      fireEvent.click(screen.getByRole("button", { name: /Go back to the zone's air temperature window/ }));
      expect(document.querySelector('[data-quantity="air.temperature"]')!.getAttribute("data-source")).toBe("zone");
      fireEvent.click(screen.getByRole("button", { name: "Check and save" }));
      await waitFor(() => expect(api.sent("PUT /api/benches/2/windows")).toHaveLength(2));
      expect(api.sent("PUT /api/benches/2/windows").map((r) => r.body)).toEqual([
        { windows: [], dewPointMarginC: null },
        { windows: [], dewPointMarginC: null },
      ]);
      expect(await screen.findByText("Bench 2 follows its zone again")).toBeTruthy();
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "a viewer reads where the bench differs, without any control",
    async () => {
      await openBench(benchApi("viewer"));
      expect(screen.getByText("Read only")).toBeTruthy();
      const row = screen.getByRole("row", { name: /Air temperature/ });
      expect(row.getAttribute("data-source")).toBe("bench");
      expect(within(row).getByText("Differs from zone")).toBeTruthy();
      expect(row.textContent).toContain("66.2 °F");
      expect(row.textContent).toContain("This bench");
      expect(screen.getByRole("row", { name: /Air humidity/ }).textContent).toContain("Zone");
      expect(screen.queryAllByRole("textbox")).toHaveLength(0);
      expect(screen.queryByRole("button", { name: /save|go back|own window|preview|rename|archive/i })).toBeNull();
    },
    ROUTE_TEST_TIMEOUT_MS,
  );
});
