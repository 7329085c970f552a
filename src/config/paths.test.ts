import { describe, expect, it } from "vitest";
import { paths, safeNextPath } from "./paths";

describe("safeNextPath", () => {
  it("keeps a path on this site, with its query", () => {
    expect(safeNextPath("/benches/2?from=x")).toBe("/benches/2?from=x");
  });

  it("refuses anything that could leave the site, and a loop back to sign-in", () => {
    for (const next of [null, "", "https://elsewhere.example/", "//elsewhere.example", "/\\elsewhere.example", "javascript:alert(1)", "/sign-in?next=/x"]) {
      expect(safeNextPath(next)).toBe("/");
    }
  });

  it("builds the sign-in address with next and email, leaving out a next of /", () => {
    expect(paths.signIn.to({ next: "/" })).toBe("/sign-in");
    expect(paths.signIn.to({ next: "/sensors", email: "a@b.test" })).toBe("/sign-in?next=%2Fsensors&email=a%40b.test");
  });
});
