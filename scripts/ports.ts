import { createServer } from 'node:net';

export async function freePort(host = '127.0.0.1'): Promise<number> {
  return new Promise<number>((resolve, reject) => {
    const server = createServer();
    // A probe socket must never keep the process alive on its own.
    server.unref();
    server.once('error', reject);
    server.listen({ port: 0, host, exclusive: true }, () => {
      const address = server.address();
      if (address === null || typeof address === 'string') {
        server.close();
        reject(new Error(`Could not read the port the OS assigned on ${host}`));
        return;
      }
      const { port } = address;
      server.close((err) => (err ? reject(err) : resolve(port)));
    });
  });
}

export async function assertPortFree(port: number, label: string, host = '127.0.0.1'): Promise<void> {
  await new Promise<void>((resolve, reject) => {
    const server = createServer();
    server.unref();
    server.once('error', (err: NodeJS.ErrnoException) => {
      // Only "in use" gets the friendly message; anything else (EACCES on a
      // privileged port, a bad host) is a different problem and stays as it is.
      if (err.code === 'EADDRINUSE') {
        reject(new Error(`Port ${port} (${label}) is already in use. Stop whatever is using it or set a different port.`));
      } else {
        reject(err);
      }
    });
    server.listen({ port, host, exclusive: true }, () => {
      server.close((err) => (err ? reject(err) : resolve()));
    });
  });
}
