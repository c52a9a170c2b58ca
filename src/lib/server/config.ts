import { appendFileSync, existsSync, readFileSync } from 'node:fs';
import { randomBytes } from 'node:crypto';
import { outboxMode as resolveOutboxMode } from '../../../server/outbox.mjs';

const ENV_FILE = '.env';

/** Loads `.env` (without overriding the environment) and creates BETTER_AUTH_SECRET there when absent. */
function loadEnvironment(): void {
  if (existsSync(ENV_FILE)) process.loadEnvFile(ENV_FILE);
  if (!process.env.BETTER_AUTH_SECRET) {
    const secret = randomBytes(32).toString('base64url');
    const current = existsSync(ENV_FILE) ? readFileSync(ENV_FILE, 'utf8') : '';
    const prefix = current && !current.endsWith('\n') ? '\n' : '';
    appendFileSync(ENV_FILE, `${prefix}BETTER_AUTH_SECRET=${secret}\n`, { mode: 0o600 });
    process.env.BETTER_AUTH_SECRET = secret;
  }
}

loadEnvironment();

const port = process.env.PORT ?? '4321';

/** Public base URL the app is reached at (links in e-mails, auth origin checks). */
export const baseUrl = (process.env.BASE_URL ?? `http://localhost:${port}`).replace(/\/$/, '');

/** Every origin a browser may use to reach this server. */
export const trustedOrigins = Array.from(
  new Set([
    baseUrl,
    `http://localhost:${port}`,
    `http://127.0.0.1:${port}`,
    ...(process.env.TRUSTED_ORIGINS ?? '')
      .split(',')
      .map((o) => o.trim())
      .filter(Boolean),
  ]),
);

export const authSecret = process.env.BETTER_AUTH_SECRET as string;
export const secureCookies = baseUrl.startsWith('https://');
export const smtpUrl = process.env.SMTP_URL || null;
export const mailFrom = process.env.MAIL_FROM ?? 'Baudbook <no-reply@baudbook.invalid>';
/**
 * Who may read the local outbox: `local` (everything, to the person at this machine only), `own` (each
 * signed-in user their own mail) or `off`. The rules and defaults are in server/outbox.mjs and decision 007;
 * `APP_MODE=production` turns the default off.
 */
export const outboxMode = resolveOutboxMode(process.env);

/** Sign-in attempts allowed per window per client address. */
export const signInLimit = {
  max: Number(process.env.SIGN_IN_MAX_ATTEMPTS ?? 5),
  windowSeconds: Number(process.env.SIGN_IN_WINDOW_SECONDS ?? 60),
};
/** Public tools API: requests per minute per client address. */
export const toolsRequestsPerMinute = Number(process.env.TOOLS_REQUESTS_PER_MINUTE ?? 120);
export const invitationDays = Number(process.env.INVITATION_DAYS ?? 7);
