import net from "node:net";

/** A loopback TCP proxy that a test can cut and restore, to take a service away from the app for real. */
export async function startTcpProxy(target: { host: string; port: number }) {
  const sockets = new Set<net.Socket>();
  let server: net.Server | null = null;
  let port = 0;

  const listen = () =>
    new Promise<void>((resolve, reject) => {
      server = net.createServer((client) => {
        const upstream = net.connect(target.port, target.host);
        sockets.add(client).add(upstream);
        const drop = () => {
          client.destroy();
          upstream.destroy();
          sockets.delete(client);
          sockets.delete(upstream);
        };
        client.pipe(upstream).pipe(client);
        client.on("error", drop).on("close", drop);
        upstream.on("error", drop).on("close", drop);
      });
      server.once("error", reject);
      server.listen(port, "127.0.0.1", () => {
        port = (server!.address() as net.AddressInfo).port;
        resolve();
      });
    });

  await listen();
  return {
    get port() {
      return port;
    },
    /** Refuses new connections and breaks open ones. */
    async cut() {
      for (const socket of sockets) socket.destroy();
      sockets.clear();
      await new Promise<void>((resolve) => (server ? server.close(() => resolve()) : resolve()));
      server = null;
    },
    async restore() {
      if (!server) await listen();
    },
    async stop() {
      await this.cut();
    },
  };
}
