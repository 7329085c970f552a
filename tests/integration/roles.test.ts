import type { Express } from "express";
import jwt from "jsonwebtoken";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ROLES, type Role } from "../../shared/schemas/auth.js";
import type { Access, RouteTable } from "../../server/lib/auth.js";
import { signIn, startTestServer, type TestServer } from "../support/test-server.js";

const ALL = ROLES;

/**
 * The role matrix (PRODUCT.md §3). Every route of the app must be listed here: adding a route
 * without adding its rule to this table fails the first test.
 */
const MATRIX: Record<string, Access> = {
  "GET /healthz": "public",
  "GET /metrics": "public",
  "POST /api/session": "public",
  "GET /api/session": ALL,
  "DELETE /api/session": "public",
  "PATCH /api/me": ALL,
  "GET /api/users": ["admin"],
  "POST /api/users": ["admin"],
  "PATCH /api/users/:id": ["admin"],
  "POST /api/password-resets": "public",
  "GET /api/password-links/:token": "public",
  "POST /api/password-links/:token": "public",
  "GET /api/sensors": ["admin"],
  "POST /api/sensors": ["admin"],
  "POST /api/sensors/:id/secret": ["admin"],
  "PATCH /api/sensors/:id": ["admin"],
  "GET /api/mail": ["admin"],
  "GET /api/zones": ALL,
  "GET /api/benches/:benchId/readings": ALL,
  "GET /api/zones/:id/readings": ALL,
  "GET /api/stream": ALL,
  "GET /api/alerts": ALL,
  "GET /api/alerts/:id": ALL,
  "POST /api/alerts/:id/acknowledge": ["admin", "manager", "grower"],
  "GET /api/ack-links/:token": "public",
  "POST /api/ack-links/:token": "public",
  "GET /api/duty-rota": ALL,
  "GET /api/duty-rota/candidates": ["admin", "manager"],
  "POST /api/duty-rota/shifts": ["admin", "manager"],
  "PUT /api/duty-rota/shifts/:id": ["admin", "manager"],
  "DELETE /api/duty-rota/shifts/:id": ["admin", "manager"],
  "PUT /api/sites/:id/alert-timing": ["admin", "manager"],
  // Layout (issue 7): sites and zones are the admin's; benches the admin's and the manager's.
  "GET /api/layout": ALL,
  "POST /api/sites": ["admin"],
  "PATCH /api/sites/:id": ["admin"],
  "POST /api/sites/:id/archive": ["admin"],
  "POST /api/sites/:id/restore": ["admin"],
  "POST /api/zones": ["admin"],
  "PATCH /api/zones/:id": ["admin"],
  "POST /api/zones/:id/archive": ["admin"],
  "POST /api/zones/:id/restore": ["admin"],
  "PUT /api/zones/:id/bench-order": ["admin", "manager"],
  "POST /api/benches": ["admin", "manager"],
  "PATCH /api/benches/:id": ["admin", "manager"],
  "POST /api/benches/:id/archive": ["admin", "manager"],
  "POST /api/benches/:id/restore": ["admin", "manager"],
  "GET /api/benches/:id/assignments": ALL,
  "GET /api/sensors/:id/assignments": ["admin"],
  "POST /api/sensors/:id/assignments": ["admin"],
  // Windows, overrides and presets (issue 7): the manager's and the admin's.
  "GET /api/zones/:id/windows": ALL,
  "PUT /api/zones/:id/windows": ["admin", "manager"],
  "POST /api/zones/:id/windows/preset": ["admin", "manager"],
  "GET /api/benches/:id/windows": ALL,
  "PUT /api/benches/:id/windows": ["admin", "manager"],
  "POST /api/benches/:id/windows/preset": ["admin", "manager"],
  "GET /api/window-presets": ALL,
  "POST /api/window-presets": ["admin", "manager"],
  "PATCH /api/window-presets/:id": ["admin", "manager"],
  "DELETE /api/window-presets/:id": ["admin", "manager"],
  "GET /api/audit": ALL,
  "GET /api/zones/:id/audit": ALL,
  "GET /api/exports/readings.csv": ALL,
  // Batches, observations, photos, walk-throughs and reports (issue 6): growers, managers and admins record; everyone reads.
  "GET /api/batches": ALL,
  "POST /api/batches": ["admin", "manager", "grower"],
  "GET /api/batches/:id": ALL,
  "PATCH /api/batches/:id": ["admin", "manager", "grower"],
  "POST /api/batches/:id/move": ["admin", "manager", "grower"],
  "POST /api/batches/:id/close": ["admin", "manager", "grower"],
  "POST /api/batches/:id/reopen": ["admin", "manager", "grower"],
  "GET /api/batches/:id/observations": ALL,
  "POST /api/batches/:id/observations": ["admin", "manager", "grower"],
  "GET /api/observations": ALL,
  "GET /api/observations/:id": ALL,
  "PATCH /api/observations/:id": ["admin", "manager", "grower"],
  "DELETE /api/observations/:id": ["admin", "manager", "grower"],
  "POST /api/observations/:id/photos": ["admin", "manager", "grower"],
  "GET /api/photos/:id": ALL,
  "GET /api/photos/:id/thumbnail": ALL,
  "DELETE /api/photos/:id": ["admin", "manager", "grower"],
  "GET /api/rounds": ALL,
  "POST /api/rounds": ["admin", "manager", "grower"],
  "GET /api/rounds/:id": ALL,
  "GET /api/rounds/:id/cards": ALL,
  "GET /api/rounds/:id/benches/:benchId/card": ALL,
  "PUT /api/rounds/:id/benches/:benchId/check": ["admin", "manager", "grower"],
  "DELETE /api/rounds/:id/benches/:benchId/check": ["admin", "manager", "grower"],
  "POST /api/rounds/:id/finish": ["admin", "manager", "grower"],
  "POST /api/rounds/:id/abandon": ["admin", "manager", "grower"],
  "GET /api/rounds/:id/summary": ALL,
  "GET /api/reports/strike-rates": ALL,
  "GET /api/exports/batches.csv": ALL,
  "GET /api/exports/observations.csv": ALL,
};

const TEST_SECRET = "role-matrix-test-secret-0123456789abcdef";
let server: TestServer;
const tokens = {} as Record<Role, string>;

beforeAll(async () => {
  server = await startTestServer({ JWT_SECRET: TEST_SECRET });
  for (const role of ROLES) tokens[role] = await signIn(server, role);
});

afterAll(async () => {
  await server.cleanup();
});

/** Every route layer Express holds, as "METHOD /path", walking nested routers. */
function expressRoutes(app: Express): string[] {
  const found: string[] = [];
  const walk = (stack: unknown[]) => {
    for (const layer of stack as { route?: { path: string; methods: Record<string, boolean> }; handle?: { stack?: unknown[] } }[]) {
      if (layer.route) {
        for (const method of Object.keys(layer.route.methods)) found.push(`${method.toUpperCase()} ${layer.route.path}`);
      } else if (layer.handle?.stack) {
        walk(layer.handle.stack);
      }
    }
  };
  walk((app as unknown as { router: { stack: unknown[] } }).router.stack);
  return found;
}

function concretePath(path: string): string {
  return path.replace(":benchId", "1").replace(":token", "not-a-real-link-token").replace(":id", "999999");
}

/** Status of one call; for the event stream, the status line is enough. */
async function statusOf(method: string, path: string, token?: string): Promise<number> {
  const controller = new AbortController();
  const res = await fetch(`${server.baseUrl}${concretePath(path)}`, {
    method,
    headers: { "Content-Type": "application/json", ...(token ? { Authorization: `Bearer ${token}` } : {}) },
    body: method === "GET" || method === "DELETE" ? undefined : "{}",
    signal: controller.signal,
  });
  controller.abort();
  return res.status;
}

describe("role matrix", () => {
  it("every route has exactly one rule, and the rules are the matrix", () => {
    const table = (server.app.locals as { routeTable: RouteTable }).routeTable;
    const declared = table.rules.map((r) => `${r.method} ${r.path}`);
    const held = expressRoutes(server.app).filter((r) => r !== "GET /{*path}"); // the client's page fallback
    expect([...held].sort()).toEqual([...declared].sort());
    expect(Object.fromEntries(table.rules.map((r) => [`${r.method} ${r.path}`, r.access]))).toEqual(MATRIX);
  });

  const guarded = Object.entries(MATRIX).filter(([, access]) => access !== "public");

  it.each(guarded)("%s without sign-in answers 401", async (route) => {
    const [method, path] = route.split(" ") as [string, string];
    expect(await statusOf(method, path)).toBe(401);
  });

  it.each(guarded.flatMap(([route, access]) => ROLES.map((role) => [route, role, (access as readonly Role[]).includes(role)] as const)))(
    "%s as %s is allowed: %s",
    async (route, role, allowed) => {
      const [method, path] = route.split(" ") as [string, string];
      const status = await statusOf(method, path, tokens[role]);
      if (allowed) expect([401, 403]).not.toContain(status);
      else expect(status).toBe(403);
    },
  );

  it("a token signed with another secret is refused", async () => {
    const forged = jwt.sign({ pwv: 1, purpose: "session" }, "another-secret-another-secret-another", { subject: "1", expiresIn: 60 });
    expect(await statusOf("GET", "/api/zones", forged)).toBe(401);
  });

  it("an expired token is refused, the same token unexpired is accepted", async () => {
    const claims = { pwv: 1, purpose: "session", sub: "1" };
    const expired = jwt.sign({ ...claims, exp: Math.floor(Date.now() / 1000) - 10 }, TEST_SECRET);
    const fresh = jwt.sign({ ...claims, exp: Math.floor(Date.now() / 1000) + 60 }, TEST_SECRET);
    expect(await statusOf("GET", "/api/zones", expired)).toBe(401);
    expect(await statusOf("GET", "/api/zones", fresh)).toBe(200);
  });

  it("a token meant for something else (a set-password link) is not a session", async () => {
    const link = jwt.sign({ pwv: 1, purpose: "reset", sub: "1" }, TEST_SECRET, { expiresIn: 60 });
    expect(await statusOf("GET", "/api/zones", link)).toBe(401);
  });
});
