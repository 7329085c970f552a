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
