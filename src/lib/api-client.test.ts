import { describe, expect, it, vi } from "vitest";
import { z } from "zod";
import { ApiError, apiGet } from "./api-client";

const schema = z.object({ ok: z.boolean() });

function respond(body: string, init: ResponseInit) {
  vi.stubGlobal("fetch", vi.fn(async () => new Response(body, init)));
}

describe("apiGet", () => {
  it("returns the validated body and sends query parameters, leaving out undefined ones", async () => {
    const fetchMock = vi.fn(async (_url: string) => new Response(JSON.stringify({ ok: true }), { status: 200 }));
    vi.stubGlobal("fetch", fetchMock);
    await expect(apiGet("/api/x", schema, { params: { from: "2025-01-01T00:00:00.000Z", to: undefined } })).resolves.toEqual({ ok: true });
    expect(fetchMock.mock.calls[0]?.[0]).toBe("/api/x?from=2025-01-01T00%3A00%3A00.000Z");
  });

  it("turns a problem+json answer into an ApiError with its status and code", async () => {
    respond(
      JSON.stringify({ type: "about:blank", title: "Not found", status: 404, code: "bench-not-found", detail: "No bench 9" }),
      { status: 404, headers: { "Content-Type": "application/problem+json" } },
    );
    const error = await apiGet("/api/benches/9/readings", schema).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(ApiError);
    expect(error).toMatchObject({ status: 404, code: "bench-not-found", message: "No bench 9", title: "Not found" });
  });

  it("keeps the field issues of a 400", async () => {
    respond(
      JSON.stringify({
        type: "about:blank",
        title: "Bad request",
        status: 400,
        code: "invalid-input",
        errors: [{ path: "from", message: "'from' must be before 'to'" }],
      }),
      { status: 400 },
    );
    const error = (await apiGet("/api/x", schema).catch((e: unknown) => e)) as ApiError;
    expect(error.fieldErrors).toEqual([{ path: "from", message: "'from' must be before 'to'" }]);
  });

  it("gives a generic http-error for a failure without a problem body", async () => {
    respond("<html>Bad gateway</html>", { status: 502, statusText: "Bad Gateway" });
    await expect(apiGet("/api/x", schema)).rejects.toMatchObject({ status: 502, code: "http-error" });
  });

  it("rejects a body that does not match the schema", async () => {
    respond(JSON.stringify({ ok: "yes" }), { status: 200 });
    await expect(apiGet("/api/x", schema)).rejects.toMatchObject({ status: 200, code: "invalid-response" });
  });

  it("reports an unreachable server as status 0, network-error", async () => {
    vi.stubGlobal("fetch", vi.fn(async () => Promise.reject(new TypeError("Failed to fetch"))));
    await expect(apiGet("/api/x", schema)).rejects.toMatchObject({ status: 0, code: "network-error" });
  });
});
