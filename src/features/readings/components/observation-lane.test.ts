import { describe, expect, it } from "vitest";
import { clusterMarkers, type ObservationMarker } from "./observation-lane";

const mark = (id: string, timeMs: number): ObservationMarker => ({ id, timeMs, when: "", title: "", details: [], isFlagged: false });

describe("observation marks that would overlap share one button", () => {
  // 1,000 ms across 500 px: 2 ms a pixel; marks closer than 36 px (72 ms) to a group's first share it.
  it("groups by distance in pixels at the lane's width, each group at the mean of its marks, in time order", () => {
    const clusters = clusterMarkers([mark("c", 500), mark("a", 100), mark("b", 150), mark("d", 560)], 0, 1000, 500);
    expect(clusters.map((c) => c.markers.map((m) => m.id))).toEqual([["a", "b"], ["c", "d"]]);
    expect(clusters[0]!.fraction).toBeCloseTo(0.125, 12);
    expect(clusters[1]!.fraction).toBeCloseTo(0.53, 12);
  });

  it("a wider lane keeps the same marks apart; a chain of close marks does not grow a group past the gap from its first", () => {
    expect(clusterMarkers([mark("a", 100), mark("b", 150)], 0, 1000, 2000)).toHaveLength(2);
    const chain = clusterMarkers([mark("a", 0), mark("b", 60), mark("c", 120), mark("d", 180)], 0, 1000, 500);
    expect(chain.map((c) => c.markers.length)).toEqual([2, 2]);
  });

  it("leaves out marks outside the range", () => {
    expect(clusterMarkers([mark("before", -1), mark("in", 10), mark("after", 1001)], 0, 1000, 500).flatMap((c) => c.markers.map((m) => m.id))).toEqual(["in"]);
  });
});
