import { fireEvent, screen, waitFor, within } from "@testing-library/react";
import { beforeEach, describe, expect, it, vi } from "vitest";
import { fahrenheitToCelsius } from "../../../../shared/domain/units.js";
import type { Role } from "../../../../shared/schemas/auth.js";
import type { ZoneWindowsInput } from "../../../../shared/schemas/windows.js";
import { NOW_MS, USERS, WINDOWS, makeSession, makeZones } from "../../../testing/data";
import { createApiFake, problem, type FakeRequest } from "../../../testing/fakes";
import { FIRST_PAINT, ROUTE_TEST_TIMEOUT_MS, renderApp } from "../../../testing/render-app";
import { AIR_MIN_WARNING, LAYOUT, PRESETS, auditEntry, auditPage, zoneWindows } from "./settings-fixtures";

function zoneApi(role: Role = "manager") {
  return createApiFake({
    "GET /api/session": { body: makeSession(USERS[role]) },
    "GET /api/zones": { body: makeZones() },
    "GET /api/layout": { body: LAYOUT },
    "GET /api/window-presets": { body: { presets: PRESETS } },
    "GET /api/zones/1/windows": { body: zoneWindows() },
    "GET /api/zones/1/audit": { body: auditPage() },
    // By default the dry run finds nothing to warn about and the save answers what was sent.
    "PUT /api/zones/1/windows": ({ search, body }) => {
      const input = body as ZoneWindowsInput;
      return { body: { ...zoneWindows({ windows: input.windows, dewPointMarginC: input.dewPointMarginC }), dryRun: search.includes("dryRun=true"), changed: true } };
    },
  });
}

const airFieldset = () => screen.getByRole("group", { name: "Air temperature" });
const field = (group: HTMLElement, label: RegExp) => within(group).getByLabelText(label) as HTMLInputElement;
const puts = (api: ReturnType<typeof zoneApi>) => api.sent("PUT /api/zones/1/windows");
const isDryRun = (r: FakeRequest) => r.search.includes("dryRun=true");

async function openZone(api: ReturnType<typeof zoneApi>) {
  renderApp("/settings/zones/1", api);
  await screen.findByRole("heading", { level: 1, name: "Fig house" }, FIRST_PAINT);
}

describe("zone settings: the rooting window", () => {
  beforeEach(() => vi.setSystemTime(NOW_MS + 30_000));

  it(
    "shows the stored SI window in °F, and sends °F input as SI (delta fields without the 32° offset); untouched fields go back exactly",
    async () => {
      const api = zoneApi();
      await openZone(api);
      const air = airFieldset();
      // 21 °C and 27 °C (NIST SP 811: t/°F = 1.8 · t/°C + 32); the 0.5 °C band is a difference: 0.9 °F.
      expect(field(air, /^Minimum \(°F\)/).value).toBe("69.8");
      expect(field(air, /^Maximum \(°F\)/).value).toBe("80.6");
      expect(field(air, /^Clearing band \(°F\)/).value).toBe("0.9");
      expect(field(air, /^Hold-off delay \(min\)/).value).toBe("10");
      expect((screen.getByLabelText(/^Dew-point margin \(°F\)/) as HTMLInputElement).value).toBe("3.6");

      fireEvent.change(field(air, /^Minimum/), { target: { value: "64" } });
      fireEvent.change(field(air, /^Clearing band/), { target: { value: "1.8" } });
      fireEvent.change(field(air, /^Hold-off delay/), { target: { value: "15" } });
      fireEvent.change(screen.getByLabelText(/^Dew-point margin/), { target: { value: "5.4" } });
      fireEvent.click(screen.getByRole("button", { name: "Check and save" }));

      await waitFor(() => expect(puts(api).filter((r) => !isDryRun(r))).toHaveLength(1));
      const [dry, saved] = puts(api);
      expect(isDryRun(dry!)).toBe(true);
      const input = saved!.body as ZoneWindowsInput;
      expect(input.windows).toHaveLength(4);
      const sentAir = input.windows[0]!;
      expect(sentAir.min).toBeCloseTo(fahrenheitToCelsius(64), 10); // 17.78 °C
      expect(sentAir.max).toBe(27); // untouched: the stored value itself, not 80.6 °F converted back
      expect(sentAir.hysteresis).toBeCloseTo(1, 10); // 1.8 °F difference = 1 °C
      expect(sentAir.delayS).toBe(900);
      expect(input.dewPointMarginC).toBeCloseTo(3, 10); // 5.4 °F difference = 3 °C
      expect(input.windows.slice(1)).toEqual(WINDOWS.slice(1));

      // The saved answer is shown back in °F.
      await waitFor(() => expect(field(airFieldset(), /^Minimum/).value).toBe("64"));
      expect(await screen.findByText("Windows saved for Fig house")).toBeTruthy();
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "refuses a minimum above the maximum on the field, with the shared schema's reason, and sends nothing",
    async () => {
      const api = zoneApi();
      await openZone(api);
      fireEvent.change(field(airFieldset(), /^Minimum/), { target: { value: "90" } });
      fireEvent.change(field(airFieldset(), /^Maximum/), { target: { value: "80" } });
      fireEvent.click(screen.getByRole("button", { name: "Check and save" }));

      const min = field(airFieldset(), /^Minimum/);
      await waitFor(() => expect(min.getAttribute("aria-invalid")).toBe("true"));
      const errorId = min.getAttribute("aria-describedby")!.split(" ").find((id) => id.endsWith("-error"))!;
      expect(document.getElementById(errorId)!.textContent).toContain("The minimum must be below the maximum");
      expect(field(airFieldset(), /^Maximum/).getAttribute("aria-invalid")).toBe("true");
      expect(puts(api)).toHaveLength(0);
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "puts the server's field issues on the fields when the server refuses (400 windows.0.max)",
    async () => {
      const api = zoneApi();
      api.routes["PUT /api/zones/1/windows"] = problem(400, "invalid-input", "Some fields are not valid", [{ path: "windows.0.max", message: "Air temperature probes read −40 to 85 °C" }]);
      await openZone(api);
      fireEvent.change(field(airFieldset(), /^Maximum/), { target: { value: "81" } });
      fireEvent.click(screen.getByRole("button", { name: "Check and save" }));
      await waitFor(() => expect(field(airFieldset(), /^Maximum/).getAttribute("aria-invalid")).toBe("true"));
      expect(within(airFieldset()).getByText("Air temperature probes read −40 to 85 °C")).toBeTruthy();
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "shows the dry run's warning with its source before saving, saves nothing until asked, then saves anyway",
    async () => {
      const api = zoneApi();
      api.routes["PUT /api/zones/1/windows"] = ({ search, body }) => {
        const input = body as ZoneWindowsInput;
        const view = zoneWindows({ windows: input.windows, dewPointMarginC: input.dewPointMarginC, warnings: [AIR_MIN_WARNING] });
        return { body: { ...view, dryRun: search.includes("dryRun=true"), changed: true } };
      };
      await openZone(api);
      fireEvent.change(field(airFieldset(), /^Minimum/), { target: { value: "64" } });
      fireEvent.click(screen.getByRole("button", { name: "Check and save" }));

      const review = await screen.findByRole("region", { name: /Check before saving: 1 warning/ });
      expect(review.textContent).toContain("Air temperature · Minimum");
      expect(review.textContent).toContain("An air minimum below about 70 °F (21 °C)");
      expect(review.textContent).toContain("Common practice: Common practice for fig and other subtropical fruit-tree cuttings");
      // The source is cited for people; our notes' file names are not shown.
      expect(review.textContent).not.toContain("REFERENCES.md");
      expect(within(review).getByText("new")).toBeTruthy();
      expect(puts(api).map(isDryRun)).toEqual([true]);

      fireEvent.click(within(review).getByRole("button", { name: "Save anyway" }));
      await waitFor(() => expect(puts(api).map(isDryRun)).toEqual([true, false]));
      expect((puts(api)[1]!.body as ZoneWindowsInput).windows[0]!.min).toBeCloseTo(fahrenheitToCelsius(64), 10);
      expect(await screen.findByText("Windows saved for Fig house")).toBeTruthy();
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "a grower sees the same window read only: values as text in °F, no field and no save button",
    async () => {
      const api = zoneApi("grower");
      await openZone(api);
      expect(screen.getByText("Read only")).toBeTruthy();
      const row = screen.getByRole("row", { name: /Air temperature/ });
      expect(row.textContent).toContain("69.8 °F");
      expect(row.textContent).toContain("80.6 °F");
      expect(row.textContent).toContain("10 min");
      expect(row.textContent).toContain("0.9 °F");
      expect(screen.queryAllByRole("textbox")).toHaveLength(0);
      expect(screen.queryByRole("button", { name: /save|apply|preview|move|archive|add|rename|edit/i })).toBeNull();
      expect(screen.queryByRole("heading", { name: "Apply a preset" })).toBeNull();
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "the zone's change log shows each field old → new in the reader's °F",
    async () => {
      const api = zoneApi();
      api.routes["GET /api/zones/1/audit"] = {
        body: auditPage([
          auditEntry({
            changes: [
              { field: "min", quantity: "air.temperature", kind: "temperature", old: fahrenheitToCelsius(70), new: fahrenheitToCelsius(64), oldLabel: null, newLabel: null },
              { field: "hysteresis", quantity: "air.temperature", kind: "temperature-difference", old: 0.5, new: 1, oldLabel: null, newLabel: null },
              { field: "delayS", quantity: "air.temperature", kind: "duration", old: 600, new: 900, oldLabel: null, newLabel: null },
              { field: "max", quantity: "medium.moisture", kind: "moisture", old: 0.45, new: 0.5, oldLabel: null, newLabel: null },
            ],
          }),
        ]),
      };
      await openZone(api);
      const log = screen.getByRole("region", { name: "Changes in this zone" });
      const text = log.querySelector('li[data-audit-id="7"]')!.textContent!;
      expect(text).toContain("Mo Manager (manager)");
      expect(text).toContain("Zone windows · Changed");
      expect(text).toContain("Air temperature minimum: 70.0 °F → 64.0 °F");
      expect(text).toContain("Air temperature clearing band: 0.9 °F → 1.8 °F");
      expect(text).toContain("Air temperature hold-off delay: 10 min → 15 min");
      expect(text).toContain("Medium moisture maximum: 45 % VWC → 50 % VWC");
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "benches are put in walking order with up and down buttons: moving Bench 2 up sends every bench in the new order",
    async () => {
      const api = zoneApi();
      api.routes["PUT /api/zones/1/bench-order"] = { body: { sites: [], zones: [], benches: [] } };
      await openZone(api);
      const list = screen.getByRole("list", { name: "Benches in walking order" });
      expect(within(list).getAllByRole("link").map((a) => a.textContent)).toEqual(["Bench 1", "Bench 2", "Bench 3"]);
      expect((within(list).getByRole("button", { name: "Move Bench 1 up" }) as HTMLButtonElement).disabled).toBe(true);
      expect(list.querySelector('[data-bench-id="2"] [data-own-windows]')).toBeTruthy();
      fireEvent.click(within(list).getByRole("button", { name: "Move Bench 2 up" }));
      await waitFor(() => expect(api.sent("PUT /api/zones/1/bench-order").map((r) => r.body)).toEqual([{ benchIds: [2, 1, 3] }]));
    },
    ROUTE_TEST_TIMEOUT_MS,
  );
});
