import { describe, expect, it } from "vitest";
import { mosquittoAclFile, mosquittoPasswordFile, mosquittoPasswordHash, mosquittoPasswordMatches } from "./mosquitto-files.js";

// Written by Debian's mosquitto_passwd 2.0.11 (`mosquitto_passwd -b passwd srv srvpw`).
const FROM_MOSQUITTO_PASSWD = "$7$101$GaHaosEWPeKqVtbi$OxFAtUPOL8M/G5EY0+3Uj2fZW7r3sl548xYQhfhJ10jfzhwSZB6YGmDysHNQFuwVhc/+PCwKp3LrcIgoftMG8A==";

describe("mosquitto password file", () => {
  it("hashes as mosquitto_passwd does: the same salt and password give its line", () => {
    const salt = Buffer.from("GaHaosEWPeKqVtbi", "base64");
    expect(mosquittoPasswordHash("srvpw", { salt })).toBe(FROM_MOSQUITTO_PASSWD);
    expect(mosquittoPasswordMatches(FROM_MOSQUITTO_PASSWD, "srvpw")).toBe(true);
    expect(mosquittoPasswordMatches(FROM_MOSQUITTO_PASSWD, "srvpx")).toBe(false);
  });

  it("draws a new 12-byte salt for every line", () => {
    const [a, b] = [mosquittoPasswordHash("same"), mosquittoPasswordHash("same")];
    expect(a).not.toBe(b);
    expect(Buffer.from(a.split("$")[3]!, "base64")).toHaveLength(12);
    expect(mosquittoPasswordMatches(a, "same") && mosquittoPasswordMatches(b, "same")).toBe(true);
  });

  it("writes one user:hash line per user and refuses a name with a colon", () => {
    const text = mosquittoPasswordFile([
      { username: "benchwarden", password: "p1" },
      { username: "air-01", password: "p2" },
    ]);
    const lines = text.trimEnd().split("\n");
    expect(lines.map((l) => l.slice(0, l.indexOf(":")))).toEqual(["benchwarden", "air-01"]);
    expect(mosquittoPasswordMatches(lines[1]!.slice("air-01:".length), "p2")).toBe(true);
    expect(() => mosquittoPasswordFile([{ username: "a:b", password: "x" }])).toThrow(/cannot be a mosquitto user name/);
  });
});

describe("mosquitto ACL file", () => {
  it("lets the server read every sensor and each sensor write only its own topics", () => {
    const acl = mosquittoAclFile("benchwarden", ["air-01", "med-02"], new Date("2026-01-01T00:00:00Z"));
    const blocks = acl.split("\n\n").slice(1);
    expect(blocks[0]).toBe(
      ["# The server instances (they subscribe through $share/<group>/…).", "user benchwarden", "topic read benchwarden/v1/sensors/+/readings", "topic read benchwarden/v1/sensors/+/status"].join("\n"),
    );
    expect(blocks[1]).toBe(["user air-01", "topic write benchwarden/v1/sensors/air-01/readings", "topic write benchwarden/v1/sensors/air-01/status"].join("\n"));
    expect(blocks[2]).toBe(["user med-02", "topic write benchwarden/v1/sensors/med-02/readings", "topic write benchwarden/v1/sensors/med-02/status", ""].join("\n"));
  });
});
