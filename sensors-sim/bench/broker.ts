/**
 * An open aedes broker on 127.0.0.1 that counts what arrives: the far end for the throughput
 * benchmark (run in its own process so it does not share the simulator's event loop).
 * Prints `port <n>` once listening and `count <messages> <bytes>` on every SIGUSR2.
 */
import net from "node:net";
import { Aedes } from "aedes";

const broker = await Aedes.createBroker({});
let messages = 0;
let bytes = 0;
broker.on("publish", (packet, client) => {
  if (!client) return;
  messages += 1;
  bytes += packet.payload.length;
});
const server = net.createServer(broker.handle);
server.listen(Number(process.env.PORT ?? 0), "127.0.0.1", () => {
  process.stdout.write(`port ${(server.address() as net.AddressInfo).port}\n`);
});
process.on("SIGUSR2", () => process.stdout.write(`count ${messages} ${bytes}\n`));
process.on("SIGTERM", () => {
  server.close();
  broker.close(() => process.exit(0));
  setTimeout(() => process.exit(0), 1000).unref();
});
