/** The SMTP path: a real SMTP server on loopback receives what the app sends; mailparser reads it back. */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SMTPServer } from 'smtp-server';
import { simpleParser, type ParsedMail } from 'mailparser';
import { freePort, startServer, type RunningServer } from '../helpers/server';
import { TestClient } from '../helpers/client';

let smtp: SMTPServer;
let app: RunningServer;
const received: ParsedMail[] = [];

beforeAll(async () => {
  const port = await freePort();
  smtp = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    onData(stream, _session, callback) {
      simpleParser(stream).then((mail) => {
        received.push(mail);
        callback();
      }, callback);
    },
  });
  await new Promise<void>((resolve) => smtp.listen(port, '127.0.0.1', resolve));
  app = await startServer({ SMTP_URL: `smtp://127.0.0.1:${port}`, MAIL_FROM: 'Baudbook test <bench@example.test>' });
}, 30_000);

afterAll(async () => {
  await app?.stop();
  await new Promise<void>((resolve) => smtp.close(() => resolve()));
});

/** The first message to `to` whose subject contains `subject` (sign-up also mails a confirmation link). */
async function waitForMail(to: string, subject: string): Promise<ParsedMail> {
  for (let i = 0; i < 100; i++) {
    const mail = received.find((m) => m.to && !Array.isArray(m.to) && m.to.text.includes(to) && (m.subject ?? '').includes(subject));
    if (mail) return mail;
    await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error(`no mail to ${to}`);
}

describe('mail over SMTP', () => {
  it('delivers an invitation with a working accept link, and keeps nothing in the outbox', async () => {
    const owner = await new TestClient(app.baseUrl).signUp('smtp-owner');
    await owner.post('/api/teams', { name: 'Relay Team' });
    const guest = await new TestClient(app.baseUrl).signUp('smtp-guest');
    expect((await owner.post('/api/invitations', { email: guest.user!.email, role: 'viewer' })).status).toBe(201);

    const mail = await waitForMail(guest.user!.email, 'Relay Team');
    expect(mail.from?.text).toContain('bench@example.test');
    const link = mail.text!.match(/https?:\/\/\S+/)![0];
    expect(mail.html).toContain(link.replace(/&/g, '&amp;'));
    const token = new URL(link).searchParams.get('token');
    expect((await guest.post('/api/invitations/accept', { token })).status).toBe(200);
    expect((await guest.get('/api/teams/current')).body.role).toBe('viewer');

    expect((await owner.get('/dev/outbox')).status).toBe(404);
  });

  it('delivers the password reset link', async () => {
    const user = await new TestClient(app.baseUrl).signUp('smtp-reset');
    await new TestClient(app.baseUrl).post('/api/auth/request-password-reset', { email: user.user!.email, redirectTo: '/reset-password' });
    const mail = await waitForMail(user.user!.email, 'Reset your Baudbook password');
    expect(mail.subject).toBe('Reset your Baudbook password');
    expect(mail.text).toContain('/api/auth/reset-password/');
  });
});
