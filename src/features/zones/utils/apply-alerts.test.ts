import { describe, expect, it } from "vitest";
import { makeAlert, makeBench, makeZone, makeZones } from "../../../testing/data";
import { applyAlertsToZones } from "./apply-alerts";

describe("applyAlertsToZones", () => {
  const zones = makeZones([
    makeZone({ id: 1, benches: [makeBench({ id: 1, alerts: [makeAlert({ id: 1 })] }), makeBench({ id: 2, name: "Bench 2" })] }),
    makeZone({ id: 2, name: "Graft house", benches: [makeBench({ id: 3, zoneId: 2 })] }),
  ]);

  it("replaces a bench's alert by id, removes it once cleared, and adds a new one; untouched zones keep their identity", () => {
    const acknowledged = makeAlert({ id: 1, phase: "acknowledged", acknowledgedByName: "Marisol" });
    const first = applyAlertsToZones(zones, [acknowledged]);
    expect(first.zones.zones[0]?.benches[0]?.alerts).toEqual([acknowledged]);
    expect(first.zones.zones[1]).toBe(zones.zones[1]);
    expect(first.zones.zones[0]?.benches[1]).toBe(zones.zones[0]?.benches[1]);

    const cleared = applyAlertsToZones(first.zones, [{ ...acknowledged, phase: "cleared" }]);
    expect(cleared.zones.zones[0]?.benches[0]?.alerts).toEqual([]);

    const added = applyAlertsToZones(zones, [makeAlert({ id: 4, benchId: 2 })]);
    expect(added.zones.zones[0]?.benches[1]?.alerts?.map((a) => a.id)).toEqual([4]);
  });

  it("leaves the list as it was for a cleared alert it never had, and names benches it does not know", () => {
    expect(applyAlertsToZones(zones, [makeAlert({ id: 7, benchId: 2, phase: "cleared" })]).zones).toBe(zones);
    expect(applyAlertsToZones(zones, [makeAlert({ id: 8, benchId: 99 })]).unknownBenchIds).toEqual([99]);
    expect(applyAlertsToZones(zones, [makeAlert({ id: 8, benchId: 99, phase: "cleared" })]).unknownBenchIds).toEqual([]);
  });
});
