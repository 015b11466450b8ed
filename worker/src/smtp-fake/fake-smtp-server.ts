import { SMTPServer } from 'smtp-server';

export interface ReceivedMessage {
  from: string | null;
  to: string[];
  raw: string;
}

export interface FakeSmtp {
  port: number;
  close(): Promise<void>;
}

/**
 * The local SMTP server of development and tests: accepts every message on loopback without
 * authentication or TLS and hands each one, whole, to `keep`. A message is acknowledged only
 * after `keep` has stored it, so a sender never counts as delivered what was not kept.
 */
export async function startFakeSmtp(options: { port: number; host?: string; keep: (m: ReceivedMessage) => Promise<unknown> }): Promise<FakeSmtp> {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['AUTH', 'STARTTLS'],
    logger: false,
    banner: 'Ratewarden development mail fake',
    size: 10 * 1024 * 1024,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (c: Buffer) => chunks.push(c));
      stream.on('error', (err) => callback(err));
      stream.on('end', () => {
        const from = session.envelope.mailFrom ? session.envelope.mailFrom.address : null;
        const to = session.envelope.rcptTo.map((r) => r.address);
        options
          .keep({ from, to, raw: Buffer.concat(chunks).toString('utf8') })
          .then(() => callback(null))
          .catch((err: unknown) => callback(err instanceof Error ? err : new Error(String(err))));
      });
    },
  });
  const host = options.host ?? '127.0.0.1';
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port, host, () => {
      server.off('error', reject);
      resolve();
    });
  });
  const address = server.server.address();
  const port = typeof address === 'object' && address ? address.port : options.port;
  return {
    port,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
