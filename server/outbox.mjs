// Who may read the local outbox (mail kept in the database when no SMTP server is configured).
// Applied by server/config.mjs to the parsed settings, so a setting that would expose mail stops the server at
// start. The decision is written down in docs/decisions/007-outbox-and-client-address.md.
import { isLoopbackHost } from './peer.mjs';

/**
 * `local`: every message, but only to the person at this machine (see resolvePeer's atMachine);
 * `own`: a signed-in user sees only messages addressed to their own e-mail address (an explicit opt-in for a
 * server others reach); `off`: nobody. Default: `local` when BASE_URL is on localhost, no proxy is trusted,
 * APP_MODE is not production and no SMTP server is set; `off` otherwise. Throws on a setting that would
 * expose mail.
 * @param {{ wanted: 'local' | 'own' | 'off' | undefined, baseUrl: string, trustedHops: number, smtp: boolean, production: boolean }} settings
 * @returns {'local' | 'own' | 'off'}
 */
export function outboxMode({ wanted, baseUrl, trustedHops, smtp, production }) {
  const baseIsLocal = isLoopbackHost(new URL(baseUrl).host);
  const proxied = trustedHops > 0;
  if (smtp) return 'off';
  if (wanted === 'local' && (!baseIsLocal || proxied)) {
    throw new Error(
      'OUTBOX=local shows every e-mail to whoever is at this machine, so it needs a BASE_URL on localhost and no TRUST_PROXY. ' +
        'On a server others reach, set SMTP_URL, or OUTBOX=own to let each signed-in user read only their own mail.',
    );
  }
  if (wanted) return wanted;
  if (production) return 'off';
  return baseIsLocal && !proxied ? 'local' : 'off';
}
