import { describe, it, expect } from "vitest";
import fc from "fast-check";
import { classifyValue, combineStatuses } from "./window-status.js";

// Medium window 21–25 °C (REFERENCES.md §6 defaults, common practice).
const MEDIUM = { min: 21, max: 25 };

describe("classifyValue", () => {
  it("the limits are inside; strictly beyond them is below or above", () => {
    expect(classifyValue(21, MEDIUM)).toBe("inside");
    expect(classifyValue(25, MEDIUM)).toBe("inside");
    expect(classifyValue(20.99, MEDIUM)).toBe("below");
    expect(classifyValue(25.01, MEDIUM)).toBe("above");
  });

  it("no window or a non-finite value is unknown", () => {
    expect(classifyValue(22, undefined)).toBe("unknown");
    expect(classifyValue(Number.NaN, MEDIUM)).toBe("unknown");
    expect(classifyValue(Number.POSITIVE_INFINITY, MEDIUM)).toBe("unknown");
  });
});

describe("combineStatuses", () => {
  it("any out-of-window status beats inside; unknown only when nothing is known", () => {
    expect(combineStatuses([])).toBe("unknown");
    expect(combineStatuses(["unknown", "unknown"])).toBe("unknown");
    expect(combineStatuses(["inside", "unknown"])).toBe("inside");
    expect(combineStatuses(["inside", "below", "unknown"])).toBe("below");
    expect(combineStatuses(["above", "inside"])).toBe("above");
  });

  it("property: inside only when every known status is inside (fast-check)", () => {
    const status = fc.constantFrom("inside" as const, "below" as const, "above" as const, "unknown" as const);
    fc.assert(
      fc.property(fc.array(status), (statuses) => {
        const combined = combineStatuses(statuses);
        const known = statuses.filter((s) => s !== "unknown");
        if (known.length === 0) return combined === "unknown";
        if (known.every((s) => s === "inside")) return combined === "inside";
        return combined !== "inside" && combined !== "unknown" && known.includes(combined);
      }),
    );
  });
});
