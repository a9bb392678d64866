import { createServer, type Server } from 'node:net';
import type { AddressInfo } from 'node:net';
import { createTransport } from 'nodemailer';
import { startTestApp, type TestApp } from './helpers/test-app.js';
import { SmtpSinkService } from '../src/mail/smtp-sink.service.js';
import { extractLinks } from '../src/mail/outbox.service.js';

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp();
});
afterAll(async () => {
  await t?.close();
});

test('the sink accepts SMTP from any client on loopback and stores the parsed message', async () => {
  const port = t.app.get(SmtpSinkService).port;
  expect(port).toBeGreaterThan(0);
  // a plain nodemailer client, not the service's MailService
  const client = createTransport({ host: '127.0.0.1', port, secure: false, ignoreTLS: true });
  await client.sendMail({
    from: 'Lab Robot <robot@lab.example>',
    to: 'One@Lab.Example, two@lab.example',
    subject: 'Übersicht: φ/ψ',
    text: 'See https://foldfolio.test/a?b=1 and http://x.test/y.\nBye',
    html: '<p>See <a href="https://foldfolio.test/a?b=1">this</a></p>',
  });
  const rows: Array<{ from_addr: string; to_addrs: string; subject: string; text_body: string }> =
    await t.db.query("SELECT * FROM mail_messages WHERE subject = 'Übersicht: φ/ψ'");
  expect(rows).toHaveLength(1);
  expect(rows[0].from_addr).toBe('robot@lab.example');
  expect(rows[0].to_addrs).toBe('one@lab.example, two@lab.example');
  expect(extractLinks(rows[0].text_body)).toEqual([
    'https://foldfolio.test/a?b=1',
    'http://x.test/y.',
  ]);
});

test('a busy sink port gives a sentence that says what to do', async () => {
  const blocker: Server = createServer();
  await new Promise<void>((r) => blocker.listen(0, '127.0.0.1', () => r()));
  const busy = (blocker.address() as AddressInfo).port;
  await expect(startTestApp({ FOLDFOLIO_SMTP_PORT: String(busy) })).rejects.toThrow(
    new RegExp(`cannot listen on 127.0.0.1:${busy} .*choose another with FOLDFOLIO_SMTP_PORT`),
  );
  blocker.close();
});
