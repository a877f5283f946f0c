import { createServer, connect, type Server, type Socket } from 'node:net';
import type { AddressInfo } from 'node:net';

/**
 * A loopback TCP relay in front of PostgreSQL. `cut()` closes the port and every open
 * connection, which from the app's side is exactly a database that went away; `restore()`
 * opens the same port again.
 */
export class TcpProxy {
  private server?: Server;
  private readonly sockets = new Set<Socket>();
  port = 0;

  constructor(
    private readonly targetHost: string,
    private readonly targetPort: number,
  ) {}

  async start(): Promise<number> {
    await this.listen(0);
    return this.port;
  }

  async cut(): Promise<void> {
    const server = this.server;
    this.server = undefined;
    for (const s of this.sockets) s.destroy();
    this.sockets.clear();
    if (server) await new Promise<void>((resolve) => server.close(() => resolve()));
  }

  async restore(): Promise<void> {
    await this.listen(this.port);
  }

  private async listen(port: number): Promise<void> {
    const server = createServer((client) => {
      const upstream = connect(this.targetPort, this.targetHost);
      this.sockets.add(client);
      this.sockets.add(upstream);
      const drop = () => {
        client.destroy();
        upstream.destroy();
        this.sockets.delete(client);
        this.sockets.delete(upstream);
      };
      client.on('error', drop).on('close', drop);
      upstream.on('error', drop).on('close', drop);
      client.pipe(upstream).pipe(client);
    });
    await new Promise<void>((resolve, reject) => {
      server.once('error', reject);
      server.listen(port, '127.0.0.1', () => resolve());
    });
    this.server = server;
    this.port = (server.address() as AddressInfo).port;
  }
}
