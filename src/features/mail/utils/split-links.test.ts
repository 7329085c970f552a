import { describe, expect, it } from "vitest";
import { splitLinks } from "./split-links";

describe("splitLinks", () => {
  it("finds http and https addresses and leaves a sentence's full stop outside the link", () => {
    expect(splitLinks("Set it here: http://localhost:8080/set-password?token=a.b-c_d. Thanks")).toEqual([
      { kind: "text", text: "Set it here: " },
      { kind: "link", href: "http://localhost:8080/set-password?token=a.b-c_d" },
      { kind: "text", text: ". Thanks" },
    ]);
  });

  it("makes no link of other schemes", () => {
    expect(splitLinks("javascript:alert(1) and data:text/html,x")).toEqual([{ kind: "text", text: "javascript:alert(1) and data:text/html,x" }]);
  });

  it("keeps text without addresses whole", () => {
    expect(splitLinks("Bench 3 is too cold")).toEqual([{ kind: "text", text: "Bench 3 is too cold" }]);
    expect(splitLinks("")).toEqual([]);
  });
});
