import net from "node:net";

/**
 * A loopback TCP relay in front of a server. `cut()` drops every open connection and refuses new ones,
 * which is how a database restart looks to a client; `restore()` listens again on the same port. Lets a
 * test take "MariaDB" away from one connection pool without stopping the MariaDB other tests share.
 */
export async function startTcpProxy(target: { host: string; port: number }) {
  const sockets = new Set<net.Socket>();
  let server: net.Server | null = null;
  let port = 0;

  const listen = () =>
    new Promise<void>((resolve, reject) => {
      const s = net.createServer((client) => {
        const upstream = net.connect(target.port, target.host);
        for (const sock of [client, upstream]) {
          sockets.add(sock);
          sock.on("close", () => sockets.delete(sock));
          sock.on("error", () => {
            client.destroy();
            upstream.destroy();
          });
        }
        client.pipe(upstream);
        upstream.pipe(client);
      });
      s.once("error", reject);
      s.listen(port, "127.0.0.1", () => {
        port = (s.address() as net.AddressInfo).port;
        server = s;
        resolve();
      });
    });

  const cut = async () => {
    const s = server;
    server = null;
    for (const sock of sockets) sock.destroy();
    sockets.clear();
    if (s) await new Promise<void>((resolve) => s.close(() => resolve()));
  };

  await listen();
  return {
    get port() {
      return port;
    },
    cut,
    restore: listen,
    close: cut,
  };
}

/** A TCP port on 127.0.0.1 that nothing listens on at the moment of the call. */
export async function sparePort(): Promise<number> {
  const s = net.createServer();
  await new Promise<void>((resolve) => s.listen(0, "127.0.0.1", () => resolve()));
  const { port } = s.address() as net.AddressInfo;
  await new Promise<void>((resolve) => s.close(() => resolve()));
  return port;
}
