import { QueryClient } from "@tanstack/react-query";
import { describe, expect, it } from "vitest";
import { NOW_MS, makeAlert } from "../../../testing/data";
import { getAlertQueryOptions } from "../api/get-alert";
import { getAlertsQueryOptions } from "../api/get-alerts";
import { applyAlertsToList, updateAlertQueries } from "./update-alert-queries";

const A = makeAlert({ id: 1, sinceMs: NOW_MS - 60_000 });
const B = makeAlert({ id: 2, sinceMs: NOW_MS - 120_000, zoneId: 2 });

describe("applyAlertsToList", () => {
  it("replaces by id, drops a cleared alert from an open list, adds a new one newest first, and keeps the array when nothing changed", () => {
    const open = { status: "open" } as const;
    const list = [A, B];
    expect(applyAlertsToList(list, [makeAlert({ id: 9, zoneId: 3, phase: "cleared" })], open)).toBe(list);

    const acknowledged = { ...A, phase: "acknowledged" as const };
    expect(applyAlertsToList(list, [acknowledged], open)).toEqual([acknowledged, B]);
    expect(applyAlertsToList(list, [{ ...A, phase: "cleared" }], open)).toEqual([B]);
    const fresh = makeAlert({ id: 3, sinceMs: NOW_MS });
    expect(applyAlertsToList(list, [fresh], open).map((a) => a.id)).toEqual([3, 1, 2]);
  });

  it("follows the filters: past lists take cleared alerts, zone and phase filters keep others out, the limit holds", () => {
    expect(applyAlertsToList([], [{ ...A, phase: "cleared" }], { status: "past" }).map((a) => a.id)).toEqual([1]);
    expect(applyAlertsToList([A], [B], { status: "open", zoneId: 1 })).toEqual([A]);
    expect(applyAlertsToList([A], [{ ...A, phase: "acknowledged" }], { status: "open", phase: "raised" })).toEqual([]);
    expect(applyAlertsToList([A], [makeAlert({ id: 5, sinceMs: NOW_MS })], { status: "open", limit: 1 }).map((a) => a.id)).toEqual([5]);
  });
});

describe("updateAlertQueries", () => {
  it("patches every cached list and the cached detail", () => {
    const queryClient = new QueryClient();
    const openKey = getAlertsQueryOptions({ status: "open" }).queryKey;
    const pastKey = getAlertsQueryOptions({ status: "past" }).queryKey;
    queryClient.setQueryData(openKey, { alerts: [A] });
    queryClient.setQueryData(pastKey, { alerts: [] });
    queryClient.setQueryData(getAlertQueryOptions(1).queryKey, { alert: A });

    const cleared = { ...A, phase: "cleared" as const, clearedAtMs: NOW_MS };
    updateAlertQueries(queryClient, [cleared]);

    expect(queryClient.getQueryData(openKey)?.alerts).toEqual([]);
    expect(queryClient.getQueryData(pastKey)?.alerts).toEqual([cleared]);
    expect(queryClient.getQueryData(getAlertQueryOptions(1).queryKey)?.alert).toEqual(cleared);
    // A detail nobody asked for is not invented.
    updateAlertQueries(queryClient, [B]);
    expect(queryClient.getQueryData(getAlertQueryOptions(2).queryKey)).toBeUndefined();
  });
});
