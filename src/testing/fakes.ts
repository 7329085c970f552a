// A stand-in for the browser's EventSource in component tests (happy-dom has none that can be driven).

export class FakeEventSource extends EventTarget {
  static instances: FakeEventSource[] = [];
  static readonly CONNECTING = 0;
  static readonly OPEN = 1;
  static readonly CLOSED = 2;

  readonly url: string;
  readyState = FakeEventSource.CONNECTING;

  constructor(url: string | URL) {
    super();
    this.url = String(url);
    FakeEventSource.instances.push(this);
  }

  static latest(): FakeEventSource {
    const last = FakeEventSource.instances.at(-1);
    if (!last) throw new Error("no EventSource was opened");
    return last;
  }

  static reset() {
    FakeEventSource.instances = [];
  }

  open() {
    this.readyState = FakeEventSource.OPEN;
    this.dispatchEvent(new Event("open"));
  }

  emit(type: string, data: unknown) {
    this.dispatchEvent(new MessageEvent(type, { data: typeof data === "string" ? data : JSON.stringify(data) }));
  }

  /** A drop the browser would retry by itself (readyState CONNECTING) or a final failure (CLOSED). */
  fail(readyState: number = FakeEventSource.CONNECTING) {
    this.readyState = readyState;
    this.dispatchEvent(new Event("error"));
  }

  close() {
    this.readyState = FakeEventSource.CLOSED;
  }
}

/** Serves fixed JSON bodies by path for `fetch`; unknown paths answer a problem+json 404. */
export function createFetchStub(routes: Record<string, unknown | (() => unknown)>) {
  const calls: string[] = [];
  const stub = async (input: RequestInfo | URL): Promise<Response> => {
    const url = new URL(String(input instanceof Request ? input.url : input), "http://localhost");
    calls.push(url.pathname + url.search);
    const route = routes[url.pathname];
    if (route === undefined) {
      return new Response(
        JSON.stringify({ type: "about:blank", title: "Not found", status: 404, code: "route-not-found" }),
        { status: 404, headers: { "Content-Type": "application/problem+json" } },
      );
    }
    const body = typeof route === "function" ? (route as () => unknown)() : route;
    return new Response(JSON.stringify(body), { status: 200, headers: { "Content-Type": "application/json" } });
  };
  return { stub, calls };
}

export type FakeRequest = { method: string; path: string; search: string; body: unknown };
export type FakeReply = { status?: number; body?: unknown };
type FakeHandler = FakeReply | ((request: FakeRequest) => FakeReply);

/** A problem-details answer (RFC 9457) as the server sends it. */
export function problem(status: number, code: string, detail?: string, errors?: { path: string; message: string }[]): FakeReply {
  return { status, body: { type: "about:blank", title: `Error ${status}`, status, code, detail, errors } };
}

export const SIGN_IN_REQUIRED = problem(401, "sign-in-required", "Sign in to continue");

/**
 * A fake of the API for `fetch`, keyed by "METHOD /path" ("GET /api/session"). Every request is
 * recorded with its parsed JSON body; `routes` can be changed between steps of a test.
 * Unknown routes answer a problem+json 404.
 */
export function createApiFake(initial: Record<string, FakeHandler>) {
  const routes = { ...initial };
  const requests: FakeRequest[] = [];
  const fetch = async (input: RequestInfo | URL, init: RequestInit = {}): Promise<Response> => {
    const url = new URL(String(input instanceof Request ? input.url : input), "http://localhost");
    const method = (init.method ?? "GET").toUpperCase();
    const body = typeof init.body === "string" ? (JSON.parse(init.body) as unknown) : undefined;
    const request = { method, path: url.pathname, search: url.search, body };
    requests.push(request);
    const handler = routes[`${method} ${url.pathname}`];
    const reply: FakeReply =
      handler === undefined ? problem(404, "route-not-found", `No API route ${method} ${url.pathname}`) : typeof handler === "function" ? handler(request) : handler;
    const status = reply.status ?? 200;
    if (status === 204 || reply.body === undefined) return new Response(null, { status });
    return new Response(JSON.stringify(reply.body), {
      status,
      headers: { "Content-Type": status >= 400 ? "application/problem+json" : "application/json" },
    });
  };
  return {
    fetch,
    requests,
    routes,
    /** The requests sent to one route, e.g. `sent("POST /api/sensors")`. */
    sent: (key: string) => requests.filter((r) => `${r.method} ${r.path}` === key),
  };
}
