/**
 * A setting the server cannot read stops it at start, before it listens, with one line per bad variable naming
 * what it accepts, and no stack trace. The parser itself: tests/server/config.test.ts.
 */
import { describe, expect, it } from 'vitest';
import { startServer } from '../helpers/server';

async function startFailure(env: Record<string, string>): Promise<string> {
  const outcome = await startServer(env).then(
    async (app) => {
      await app.stop();
      return null;
    },
    (err: Error) => err.message,
  );
  expect(outcome, 'the server started').not.toBeNull();
  return outcome!;
}

describe('a bad setting', () => {
  it.each([
    // Each of these used to start with a silent default (or NaN): now they stop the server.
    ['UPLOAD_MAX_BYTES', '20MB', 'UPLOAD_MAX_BYTES must be a whole number of bytes (1 or more); got "20MB".'],
    ['SIGN_IN_MAX_ATTEMPTS', 'five', 'SIGN_IN_MAX_ATTEMPTS must be a whole number of attempts (1 or more); got "five".'],
    ['APP_MODE', 'prod', 'APP_MODE must be development or production; got "prod".'],
    ['BASE_URL', 'baudbook.example', 'BASE_URL must be an http:// or https:// address; got "baudbook.example".'],
    ['TRUST_PROXY', 'x', 'TRUST_PROXY must be a number of proxies (0 to 99, or true/false); got "x".'],
  ])('%s=%j stops the server at start with its message', async (name, value, message) => {
    const output = await startFailure({ [name]: value });
    expect(output).toContain('Server exited early (code 1):');
    expect(output).toContain(`Baudbook cannot start: a setting is not valid.\n${message}\n`);
    expect(output).not.toMatch(/^\s+at /m);
    expect(output).not.toContain('listening');
  });

  it('is listed with every other bad value, one line each', async () => {
    const output = await startFailure({ INVITATION_DAYS: '0', SEED_DEMO: 'maybe', TRUSTED_ORIGINS: 'baudbook.example' });
    expect(output).toContain(
      'Baudbook cannot start: settings are not valid.\n' +
        'TRUSTED_ORIGINS must be comma-separated origins such as https://baudbook.example (scheme, host and port; no path); got "baudbook.example".\n' +
        'INVITATION_DAYS must be a whole number of days (1 to 365); got "0".\n' +
        'SEED_DEMO must be 1 or 0 (or true/false, yes/no, on/off); got "maybe".\n',
    );
    expect(output).not.toMatch(/^\s+at /m);
  });

  it('that may hold a password is named without repeating it', async () => {
    const output = await startFailure({ SMTP_URL: 'mail.example user:hunter2-secret' });
    expect(output).toContain('SMTP_URL must be an smtp:// or smtps:// address; the value given is not (not repeated here: it may hold a password).');
    expect(output).not.toContain('hunter2-secret');
  });
});
