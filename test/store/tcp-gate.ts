/**
 * A loopback TCP relay in front of the PostgreSQL server that a test can shut
 * (refusing new connections and cutting open ones) and open again: an outage
 * and its end, without touching the real server other suites use.
 */
import net from 'node:net';

export interface TcpGate {
  port: number;
  /** Cut every relayed connection and refuse new ones until open(). */
  shut(): void;
  open(): void;
  close(): Promise<void>;
}

export async function startTcpGate(targetHost: string, targetPort: number): Promise<TcpGate> {
  let isOpen = true;
  const sockets = new Set<net.Socket>();
  const server = net.createServer((client) => {
    if (!isOpen) {
      client.destroy();
      return;
    }
    const upstream = net.connect(targetPort, targetHost);
    for (const s of [client, upstream]) {
      sockets.add(s);
      s.on('close', () => sockets.delete(s));
      s.on('error', () => {
        client.destroy();
        upstream.destroy();
      });
    }
    client.pipe(upstream);
    upstream.pipe(client);
  });
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const port = (server.address() as net.AddressInfo).port;
  return {
    port,
    shut() {
      isOpen = false;
      for (const s of sockets) s.destroy();
    },
    open() {
      isOpen = true;
    },
    close: () =>
      new Promise<void>((resolve) => {
        isOpen = false;
        for (const s of sockets) s.destroy();
        server.close(() => resolve());
      }),
  };
}
