// A local SMTP catcher: accepts every message on loopback and keeps it in PostgreSQL,
// so sign-up, reset and review mail can be read at /admin/mail without a real mail server.
import { SMTPServer } from 'smtp-server';
import { simpleParser } from 'mailparser';
import pg from 'pg';
import { databaseUrl } from '../db/config';

const port = Number(process.env.SMTP_CATCHER_PORT ?? 2525);
const pool = new pg.Pool({ connectionString: databaseUrl(), max: 2 });

const server = new SMTPServer({
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

server.listen(port, '127.0.0.1', () => console.log(`mail catcher listening on 127.0.0.1:${port}`));

function shutdown() {
  server.close(() => void pool.end().then(() => process.exit(0)));
}
process.on('SIGTERM', shutdown);
process.on('SIGINT', shutdown);
