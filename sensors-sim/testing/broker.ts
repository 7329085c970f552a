import net from "node:net";
import { Aedes, type AuthenticateError } from "aedes";
import type { SensorCredential } from "../credentials.js";

/** One PUBLISH the test broker let through, with who sent it. */
export interface Received {
  clientId: string;
  username: string | undefined;
  topic: string;
  payload: Buffer;
  qos: number;
}

export interface TestBroker {
  port: number;
  url: string;
  /** Accepted publishes, readings and wills, in arrival order (survives restarts). */
  received: Received[];
  /** Publishes refused by authorizePublish (not the sender's own topic). */
  refused: Received[];
  /** CONNECTs refused by authenticate. */
  badLogins: Array<{ clientId: string; username: string | undefined }>;
  /** Stop abruptly: every connection dropped, the port closed (a crash, as the clients see it). */
  crash(): Promise<void>;
  /** Start again on the same port. */
  restart(): Promise<void>;
  close(): Promise<void>;
}

/**
 * A real aedes broker on 127.0.0.1 for the simulator's tests: authenticate checks username =
 * sensor id and password = secret against the credentials; authorizePublish allows a sensor only
 * its own topics (benchwarden/v1/sensors/<id>/…), like the server's ingest (PRODUCT.md §4).
 */
export async function startTestBroker(credentials: readonly SensorCredential[], port = 0): Promise<TestBroker> {
  const secrets = new Map(credentials.map((c) => [c.id, c.secret]));
  const usernames = new Map<string, string | undefined>();
  const received: Received[] = [];
  const refused: Received[] = [];
  const badLogins: TestBroker["badLogins"] = [];
  let broker: Aedes | undefined;
  let server: net.Server | undefined;
  const sockets = new Set<net.Socket>();

  const start = async (listenPort: number): Promise<number> => {
    const b = await Aedes.createBroker({
      authenticate: (client, username, password, done) => {
        if (username !== undefined && secrets.get(username) === password?.toString("utf8")) {
          usernames.set(client.id, username);
          done(null, true);
          return;
        }
        badLogins.push({ clientId: client.id, username });
        const err = new Error("bad user name or password") as AuthenticateError;
        err.returnCode = 4;
        done(err, null);
      },
      authorizePublish: (client, packet, callback) => {
        const username = client ? usernames.get(client.id) : undefined;
        const entry: Received = {
          clientId: client?.id ?? "",
          username,
          topic: packet.topic,
          payload: Buffer.from(packet.payload),
          qos: packet.qos,
        };
        if (!username || !packet.topic.startsWith(`benchwarden/v1/sensors/${username}/`)) {
          refused.push(entry);
          callback(new Error("not your topic"));
          return;
        }
        received.push(entry);
        callback(null);
      },
    });
    const s = net.createServer(b.handle);
    s.on("connection", (socket) => {
      sockets.add(socket);
      socket.on("close", () => sockets.delete(socket));
    });
    await new Promise<void>((resolve, reject) => {
      s.once("error", reject);
      s.listen(listenPort, "127.0.0.1", () => resolve());
    });
    broker = b;
    server = s;
    return (s.address() as net.AddressInfo).port;
  };

  const stop = async () => {
    const s = server;
    const b = broker;
    server = undefined;
    broker = undefined;
    for (const socket of sockets) socket.destroy();
    sockets.clear();
    await Promise.all([
      new Promise<void>((resolve) => (s ? s.close(() => resolve()) : resolve())),
      new Promise<void>((resolve) => (b ? b.close(() => resolve()) : resolve())),
    ]);
  };

  const actualPort = await start(port);
  return {
    port: actualPort,
    url: `mqtt://127.0.0.1:${actualPort}`,
    received,
    refused,
    badLogins,
    crash: stop,
    restart: async () => {
      await start(actualPort);
    },
    close: stop,
  };
}
