/** An in-process SMTP server (smtp-server) that keeps every message it receives, for mail tests. */
import { SMTPServer } from 'smtp-server';

export interface Received {
  to: string[];
  messageId: string | null;
  subject: string | null;
  raw: string;
}

export interface TestSmtp {
  port: number;
  messages: Received[];
  /** Starts listening (again) on `port`. */
  start(): Promise<void>;
  /** Stops listening: the mail server is then "down". */
  stop(): Promise<void>;
}

const header = (raw: string, name: string): string | null => {
  const m = new RegExp(`^${name}:\\s*(.*(?:\\r?\\n[ \\t].*)*)`, 'im').exec(raw);
  return m ? m[1]!.replace(/\r?\n[ \t]+/g, ' ').trim() : null;
};

/** A mail server for `port`, not yet listening. */
export function testSmtp(port: number): TestSmtp {
  const messages: Received[] = [];
  let server: SMTPServer | null = null;
  return {
    port,
    messages,
    start() {
      server = new SMTPServer({
        authOptional: true,
        disabledCommands: ['STARTTLS', 'AUTH'],
        logger: false,
        onData(stream, session, done) {
          let raw = '';
          stream.on('data', (d: Buffer) => (raw += d.toString()));
          stream.on('end', () => {
            messages.push({
              to: session.envelope.rcptTo.map((r) => r.address),
              messageId: header(raw, 'Message-ID'),
              subject: header(raw, 'Subject'),
              raw,
            });
            done();
          });
        },
      });
      const s = server;
      return new Promise((resolve, reject) => {
        s.once('error', reject);
        s.listen(port, '127.0.0.1', () => resolve());
      });
    },
    stop() {
      const s = server;
      server = null;
      return new Promise((resolve) => (s ? s.close(() => resolve()) : resolve()));
    },
  };
}

/** The server's mail settings for a test: SMTP on loopback at `port`, quick polls and retries. */
export function mailEnv(port: number, publicUrl: string): Record<string, string> {
  return {
    SMTP_HOST: '127.0.0.1',
    SMTP_PORT: String(port),
    MAIL_FROM: 'Coneline <coneline@school.example>',
    PUBLIC_URL: publicUrl,
    MAIL_POLL_MS: '200',
    MAIL_RETRY_MS: '200',
  };
}
