import { screen } from "@testing-library/react";
import { beforeEach, describe, expect, it, vi } from "vitest";
import type { AuditChange } from "../../../../shared/schemas/audit.js";
import { NOW_MS, USERS, makeSession, makeZones } from "../../../testing/data";
import { createApiFake } from "../../../testing/fakes";
import { FIRST_PAINT, ROUTE_TEST_TIMEOUT_MS, renderApp } from "../../../testing/render-app";
import { LAYOUT, auditEntry, auditPage } from "./settings-fixtures";

/** A change as the rota service writes it: raw value with the words it was known by. */
function change(field: string, kind: AuditChange["kind"], [oldValue, oldLabel]: [AuditChange["old"], string | null], [newValue, newLabel]: [AuditChange["new"], string | null]): AuditChange {
  return { field, quantity: null, kind, old: oldValue, new: newValue, oldLabel, newLabel };
}

const NONE: [null, null] = [null, null];

const ENTRIES = [
  auditEntry({
    id: 13,
    entityType: "site",
    entityId: "1",
    subject: "Hillside nursery",
    zoneId: null,
    changes: [change("escalateAfterS", "duration", [null, "20 minutes (the default)"], [900, "15 minutes"])],
  }),
  auditEntry({
    id: 12,
    entityType: "duty-rota",
    entityId: "5",
    action: "deleted",
    subject: "Gil Grower · Every zone",
    zoneId: null,
    changes: [change("userId", "reference", [3, "Gil Grower"], NONE), change("weekdays", "number", [127, "Every day"], NONE), change("isFallback", "boolean", [false, null], NONE)],
  }),
  auditEntry({
    id: 11,
    entityType: "duty-rota",
    entityId: "4",
    subject: "Mo Manager · Graft house",
    zoneId: 2,
    changes: [
      change("userId", "reference", [3, "Gil Grower"], [2, "Mo Manager"]),
      change("zoneId", "reference", [null, "Every zone"], [2, "Graft house"]),
      change("startMinute", "number", [1320, "22:00"], [1200, "20:00"]),
      change("isFallback", "boolean", [false, null], [true, null]),
    ],
  }),
  auditEntry({
    id: 10,
    entityType: "duty-rota",
    entityId: "4",
    action: "created",
    subject: "Gil Grower · Every zone",
    zoneId: null,
    changes: [
      change("userId", "reference", NONE, [3, "Gil Grower"]),
      change("zoneId", "reference", NONE, [null, "Every zone"]),
      change("weekdays", "number", NONE, [62, "Mon–Fri"]),
      change("startMinute", "number", NONE, [1320, "22:00"]),
      change("endMinute", "number", NONE, [360, "06:00"]),
      change("isFallback", "boolean", NONE, [false, null]),
    ],
  }),
];

function entryText(id: number): string {
  return document.querySelector(`li[data-audit-id="${id}"]`)!.textContent!.replace(/\s+/g, " ");
}

describe("change log", () => {
  beforeEach(() => vi.setSystemTime(NOW_MS + 30_000));

  it(
    "duty shifts and a site's alert times read in plain words: what a new shift is, what changed old → new, what a deleted shift was",
    async () => {
      const api = createApiFake({
        "GET /api/session": { body: makeSession(USERS.grower) },
        "GET /api/zones": { body: makeZones() },
        "GET /api/layout": { body: LAYOUT },
        "GET /api/audit": { body: auditPage(ENTRIES) },
      });
      renderApp("/settings/changes", api);
      await screen.findByRole("heading", { level: 1, name: "Change log" }, FIRST_PAINT);

      const created = entryText(10);
      expect(created).toContain("Gil Grower · Every zone");
      expect(created).toContain("Duty rota · Created");
      expect(created).toContain("Mo Manager (manager)");
      for (const line of ["Person on duty: Gil Grower", "Zone: Every zone", "Days: Mon–Fri", "From: 22:00", "Until: 06:00", "Fallback: no"]) expect(created).toContain(line);
      // Nothing was there before: no "none →" on every line.
      expect(created).not.toContain("none");
      expect(created).not.toContain("→");

      const changed = entryText(11);
      expect(changed).toContain("Duty rota · Changed");
      for (const line of ["Person on duty: Gil Grower → Mo Manager", "Zone: Every zone → Graft house", "From: 22:00 → 20:00", "Fallback: no → yes"]) expect(changed).toContain(line);

      const deleted = entryText(12);
      expect(deleted).toContain("Duty rota · Deleted");
      for (const line of ["Person on duty: Gil Grower", "Days: Every day", "Fallback: no"]) expect(deleted).toContain(line);
      expect(deleted).not.toContain("none");

      const timing = entryText(13);
      expect(timing).toContain("Site · Changed");
      expect(timing).toContain("Managers told after: 20 minutes (the default) → 15 minutes");
    },
    ROUTE_TEST_TIMEOUT_MS,
  );
});
