// Who may read the local outbox (mail kept in the database when no SMTP server is configured).
// Shared by the server entry (which refuses to start on a bad setting) and the app (which applies it).
// The decision is written down in docs/decisions/007-outbox-and-client-address.md.
import { isLoopbackHost, parseTrustProxy } from './peer.mjs';

/**
 * `local`: every message, but only to the person at this machine (see resolvePeer's atMachine);
 * `own`: a signed-in user sees only messages addressed to their own e-mail address (an explicit opt-in for a
 * server others reach); `off`: nobody. Default: `local` when BASE_URL is on localhost, no proxy is trusted,
 * APP_MODE is not production and no SMTP server is set; `off` otherwise. Throws on a setting that would
 * expose mail.
 * @param {Record<string, string | undefined>} env
 * @returns {'local' | 'own' | 'off'}
 */
export function outboxMode(env) {
  const port = env.PORT ?? '4321';
  const base = env.BASE_URL || `http://localhost:${port}`;
  let baseIsLocal = false;
  try {
    baseIsLocal = isLoopbackHost(new URL(base).host);
  } catch {
    baseIsLocal = false;
  }
  const proxied = parseTrustProxy(env.TRUST_PROXY) > 0;
  const wanted = (env.OUTBOX ?? '').trim().toLowerCase();
  if (wanted && !['local', 'own', 'off'].includes(wanted)) {
    throw new Error(`OUTBOX must be local, own or off; got "${env.OUTBOX}".`);
  }
  if (env.SMTP_URL) return 'off';
  if (wanted === 'local' && (!baseIsLocal || proxied)) {
    throw new Error(
      'OUTBOX=local shows every e-mail to whoever is at this machine, so it needs a BASE_URL on localhost and no TRUST_PROXY. ' +
        'On a server others reach, set SMTP_URL, or OUTBOX=own to let each signed-in user read only their own mail.',
    );
  }
  if (wanted) return /** @type {'local' | 'own' | 'off'} */ (wanted);
  if (env.APP_MODE === 'production') return 'off';
  return baseIsLocal && !proxied ? 'local' : 'off';
}
