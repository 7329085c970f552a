import { afterEach, describe, expect, it, vi } from "vitest";
import { makeClientId } from "./client-id";

const UUID_V4 = /^[0-9a-f]{8}-[0-9a-f]{4}-4[0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}$/;

describe("the observation's clientId", () => {
  afterEach(() => vi.unstubAllGlobals());

  it("is a v4 UUID the server's schema accepts, also on plain HTTP where crypto.randomUUID is missing", () => {
    vi.stubGlobal("isSecureContext", false);
    const ids = new Set(Array.from({ length: 200 }, () => makeClientId()));
    expect(ids.size).toBe(200);
    for (const id of ids) expect(id).toMatch(UUID_V4);
  });
});
