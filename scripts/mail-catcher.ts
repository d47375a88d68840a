// A local SMTP catcher: accepts every message on loopback and keeps it in PostgreSQL,
// so sign-up, reset and review mail can be read without a real mail server.
//
// Outage drill: `NOTIFY mail_catcher, 'down'` on its database closes the listening socket
// (senders get "connection refused", like a relay that is away) and `NOTIFY mail_catcher, 'up'`
// opens it again; tests/integration/mail-queue.test.ts uses it to prove no mail is lost.
import { SMTPServer } from 'smtp-server';
import { simpleParser } from 'mailparser';
import pg from 'pg';
import { databaseUrl } from '../db/config';

const port = Number(process.env.SMTP_CATCHER_PORT ?? 2525);
const pool = new pg.Pool({ connectionString: databaseUrl(), max: 2 });

function makeServer() {
  return new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    size: 10 * 1024 * 1024,
    logger: false,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (chunk: Buffer) => chunks.push(chunk));
      stream.on('end', async () => {
        try {
          const raw = Buffer.concat(chunks);
          const parsed = await simpleParser(raw);
          const from = session.envelope.mailFrom ? session.envelope.mailFrom.address : null;
          const to = session.envelope.rcptTo.map((r) => r.address.toLowerCase());
          await pool.query(
            'INSERT INTO mail_messages (envelope_from, envelope_to, subject, text_body, raw) VALUES ($1, $2, $3, $4, $5)',
            [from, to, parsed.subject ?? null, parsed.text ?? null, raw.toString('utf8')],
          );
          callback();
        } catch (err) {
          console.error('mail catcher could not store a message', err);
          callback(err as Error);
        }
      });
    },
  });
}

let server: SMTPServer | undefined = makeServer();
server.listen(port, '127.0.0.1', () => console.log(`mail catcher listening on 127.0.0.1:${port}`));

const control = new pg.Client({ connectionString: databaseUrl() });
control.on('notification', (msg) => {
  if (msg.payload === 'down' && server) {
    const closing = server;
    server = undefined;
    closing.close(() => console.log('mail catcher down (drill)'));
  } else if (msg.payload === 'up' && !server) {
    server = makeServer();
    server.listen(port, '127.0.0.1', () => console.log(`mail catcher up again on 127.0.0.1:${port}`));
  }
});
control.on('error', (err) => console.error('mail catcher control channel:', err.message));
control.connect().then(() => control.query('LISTEN mail_catcher')).catch((err) => console.error('mail catcher control channel:', err.message));

function shutdown() {
  void control.end().catch(() => undefined);
  const done = () => void pool.end().then(() => process.exit(0));
  if (server) server.close(done);
  else done();
}
process.on('SIGTERM', shutdown);
process.on('SIGINT', shutdown);
