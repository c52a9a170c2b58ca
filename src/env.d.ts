/// <reference types="astro/client" />

declare namespace App {
  interface Locals {
    /** Signed-in user, or null. */
    user: { id: string; name: string; email: string } | null;
    sessionId: string | null;
    /** Every team the user belongs to, with the role held there. */
    teams: import('./lib/server/session').TeamOfUser[];
    /** The active team (chosen with the team switcher), or null when the user has none. */
    team: import('./lib/server/session').TeamOfUser | null;
    /**
     * Who sent the request, resolved by server/serve.mjs before the app runs: the client address (the
     * socket's unless TRUST_PROXY trusts proxies) and whether it is the person at this machine.
     */
    peer: { address: string; atMachine: boolean };
    /** The local outbox's key, printed by server/serve.mjs at start (local outbox mode only). */
    outboxKey?: string;
  }
}
