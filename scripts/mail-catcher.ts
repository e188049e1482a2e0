import { randomBytes } from 'node:crypto';
import { createWriteStream, promises as fs } from 'node:fs';
import path from 'node:path';
import { pipeline } from 'node:stream/promises';
import { pathToFileURL } from 'node:url';
import { SMTPServer } from 'smtp-server';

export interface MailCatcher {
  port: number;
  dir: string;
  close(): Promise<void>;
}

/**
 * The local stand-in for a real SMTP relay: accepts every message on loopback and writes it,
 * exactly as received, to <dir>/<time>-<random>.eml. Development and tests only.
 */
export async function startMailCatcher(opts: { port: number; dir: string; host?: string }): Promise<MailCatcher> {
  await fs.mkdir(opts.dir, { recursive: true });
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    banner: 'Plinth local mail catcher',
    size: 25 * 1024 * 1024,
    logger: false,
    onData(stream, _session, callback) {
      const name = `${new Date().toISOString().replace(/[:.]/g, '-')}-${randomBytes(4).toString('hex')}.eml`;
      const tmp = path.join(opts.dir, `.${name}.part`);
      pipeline(stream, createWriteStream(tmp))
        .then(() => fs.rename(tmp, path.join(opts.dir, name)))
        .then(() => callback(), (err: Error) => callback(err));
    },
  });
  const host = opts.host ?? '127.0.0.1';
  await new Promise<void>((resolve, reject) => {
    const onError = (err: NodeJS.ErrnoException) =>
      reject(err.code === 'EADDRINUSE' ? new Error(`Port ${opts.port} (mail catcher) is already in use.`) : err);
    server.once('error', onError);
    server.listen(opts.port, host, () => {
      server.off('error', onError);
      resolve();
    });
  });
  server.on('error', (err) => console.error(`mail catcher: ${err.message}`));
  const address = server.server.address();
  const port = typeof address === 'object' && address ? address.port : opts.port;
  return {
    port,
    dir: opts.dir,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  const port = Number(process.env.SMTP_CATCHER_PORT ?? 2525);
  const dir = path.resolve(process.env.MAIL_DIR ?? path.join(import.meta.dirname, '..', 'storage', 'mail'));
  const catcher = await startMailCatcher({ port, dir });
  console.log(`Mail catcher on smtp://127.0.0.1:${catcher.port}, writing to ${dir}`);
  const stop = () => void catcher.close().then(() => process.exit(0));
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}
