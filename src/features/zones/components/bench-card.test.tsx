import { render, screen, within } from "@testing-library/react";
import { MemoryRouter } from "react-router-dom";
import { describe, expect, it } from "vitest";
import { TemperatureUnitProvider } from "../../../lib/temperature-unit";
import { NOW_MS, makeAlert, makeBench, reading } from "../../../testing/data";
import { BenchCard } from "./bench-card";

function renderCard(bench = makeBench(), unit: "F" | "C" = "F") {
  return render(
    <MemoryRouter>
      <TemperatureUnitProvider>
        <BenchCard bench={bench} unit={unit} nowMs={NOW_MS} />
      </TemperatureUnitProvider>
    </MemoryRouter>,
  );
}

function tile(name: string) {
  return screen.getByRole("group", { name });
}

describe("BenchCard", () => {
  it("marks an air temperature below the window as Too cold, with the down-arrow icon and the value in °F", () => {
    renderCard(
      makeBench({
        status: "below",
        latest: [
          reading("air.temperature", 16, "below"),
          reading("air.humidity", 75, "inside"),
          reading("medium.temperature", 23, "inside"),
          reading("medium.moisture", 0.35, "inside"),
        ],
      }),
    );

    const air = tile("Air temperature");
    expect(within(air).getByText("Too cold")).toBeTruthy();
    expect(air.querySelector('svg[data-icon="below"]')).not.toBeNull();
    expect(air.textContent).toContain("60.8");
    expect(air.textContent).toContain("°F");
    expect(air.getAttribute("data-status")).toBe("below");
    // The status also shows as a solid fill, but never as colour alone: text and icon are there.
    expect(air.className).toContain("bg-low");

    expect(within(tile("Air humidity")).getByText("In window")).toBeTruthy();
    expect(tile("Air humidity").querySelector('svg[data-icon="inside"]')).not.toBeNull();
    expect(screen.getByText("Out of window")).toBeTruthy();
  });

  it("names each quantity's own problem: humid air, a wet medium, a warm medium", () => {
    renderCard(
      makeBench({
        status: "above",
        latest: [
          reading("air.temperature", 24, "inside"),
          reading("air.humidity", 96, "above"),
          reading("medium.temperature", 29, "above"),
          reading("medium.moisture", 0.62, "above"),
        ],
      }),
    );
    expect(within(tile("Air humidity")).getByText("Too humid")).toBeTruthy();
    expect(within(tile("Medium temperature")).getByText("Medium too warm")).toBeTruthy();
    expect(within(tile("Medium moisture")).getByText("Medium too wet")).toBeTruthy();
    expect(tile("Medium moisture").textContent).toContain("62");
    expect(tile("Medium moisture").textContent).toContain("% VWC");
    expect(tile("Medium moisture").querySelector('svg[data-icon="above"]')).not.toBeNull();
  });

  it("says No reading for a quantity the bench has never reported", () => {
    renderCard(makeBench({ latest: [reading("air.temperature", 24, "inside")] }));
    const medium = tile("Medium moisture");
    expect(within(medium).getByText("No reading")).toBeTruthy();
    expect(medium.querySelector('svg[data-icon="unknown"]')).not.toBeNull();
    expect(screen.getByText("All in window")).toBeTruthy();
  });

  it("shows the age of each reading and calls out one that is old", () => {
    renderCard(
      makeBench({
        latest: [
          reading("air.temperature", 24, "inside", 5 * 60_000),
          reading("air.humidity", 75, "inside", 2 * 3_600_000),
        ],
      }),
    );
    expect(within(tile("Air temperature")).getByText("5 min ago")).toBeTruthy();
    expect(within(tile("Air humidity")).getByText("Last reading 2 h ago")).toBeTruthy();
    expect(screen.queryByText(/No new readings/)).toBeNull();
  });

  it("says so at the top when every reading of the bench is old", () => {
    renderCard(makeBench({ latest: [reading("air.temperature", 24, "inside", 3 * 3_600_000)] }));
    expect(screen.getByText("No new readings for 3 h")).toBeTruthy();
  });

  it("shows the window in the chosen unit and links the card to the bench page", () => {
    renderCard(makeBench({ id: 7, name: "Bench 7" }), "C");
    expect(within(tile("Air temperature")).getByText("Window 21.0–27.0 °C")).toBeTruthy();
    expect(within(tile("Medium moisture")).getByText("Window 25–45 % VWC")).toBeTruthy();
    const link = screen.getByRole("link", { name: /Bench 7/ });
    expect(link.getAttribute("href")).toBe("/benches/7");
  });
});

describe("BenchCard alerts", () => {
  it("lists the open alerts in words with the phase icon, raised first, each a link to the alert; a raised one marks the card", () => {
    renderCard(
      makeBench({
        alerts: [
          makeAlert({ id: 4, phase: "acknowledged", acknowledgedByName: "Marisol", sinceMs: NOW_MS - 3_600_000 }),
          makeAlert({ id: 5, phase: "raised", kind: "condensation", quantity: null, direction: null, lastValue: 1, summary: "Condensation risk" }),
          makeAlert({ id: 6, phase: "watching", raisedAtMs: null }),
        ],
      }),
    );
    const list = screen.getByRole("list", { name: "Open alerts on Bench 1" });
    const links = within(list).getAllByRole("link");
    expect(links.map((l) => l.getAttribute("href"))).toEqual(["/alerts/5", "/alerts/6", "/alerts/4"]);
    expect(links[0]?.textContent).toMatch(/^Raised .* · Condensation risk · 1\.8 °F above the dew point$/);
    expect(links[0]?.querySelector("svg[data-icon='phase-raised']")).not.toBeNull();
    expect(links[1]?.textContent).toContain("Watching: hold-off running · Air too cold");
    expect(links[2]?.textContent).toContain("Acknowledged by Marisol · Air too cold");
    expect(screen.getByRole("article").className).toContain("border-high");
  });

  it("shows no alert list for a bench without open alerts", () => {
    renderCard(makeBench({ alerts: [] }));
    expect(screen.queryByRole("list", { name: /Open alerts/ })).toBeNull();
  });
});
