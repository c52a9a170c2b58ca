import { timingSafeEqual } from 'node:crypto';
import type { AstroCookies } from 'astro';
import nodemailer from 'nodemailer';
import { desc, sql } from 'drizzle-orm';
import { db } from '../../db/client';
import { outboxMessage } from '../../db/schema';
import { config } from '../../config';

export interface MailMessage {
  to: string;
  subject: string;
  text: string;
  html?: string;
}

let transport: nodemailer.Transporter | null = null;

/** Sends through SMTP when SMTP_URL is set, otherwise keeps the message in the local outbox. */
export async function sendMail(message: MailMessage): Promise<void> {
  if (config.smtpUrl) {
    transport ??= nodemailer.createTransport(config.smtpUrl);
    await transport.sendMail({ from: config.mailFrom, ...message });
    return;
  }
  await db.insert(outboxMessage).values({ id: crypto.randomUUID(), ...message });
}

/** What of the outbox a request may read: every message, only mail to one address, or nothing. */
export type OutboxView = { kind: 'all' } | { kind: 'own'; email: string } | null;

export const OUTBOX_COOKIE = 'bb_outbox';

function sameKey(given: string | undefined, key: string): boolean {
  if (!given) return false;
  const a = Buffer.from(given);
  const b = Buffer.from(key);
  return a.length === b.length && timingSafeEqual(a, b);
}

/**
 * Applies the outbox mode to one request (see server/outbox.mjs and decision 007). In `local` mode the request
 * must come from the person at this machine and carry the key the server printed at start (in the link's
 * `key`, or the cookie that link sets); under `astro dev` there is no key and the first condition suffices.
 */
export function outboxView(locals: App.Locals, cookies: AstroCookies, key?: string | null): OutboxView {
  if (config.outbox === 'local') {
    if (!locals.peer.atMachine) return null;
    if (!locals.outboxKey) return import.meta.env.DEV ? { kind: 'all' } : null;
    return sameKey(key ?? cookies.get(OUTBOX_COOKIE)?.value, locals.outboxKey) ? { kind: 'all' } : null;
  }
  if (config.outbox === 'own') return locals.user ? { kind: 'own', email: locals.user.email } : null;
  return null;
}

/** The newest messages the view allows, newest first. */
export function listOutbox(view: Exclude<OutboxView, null>, limit = 50) {
  const query = db.select().from(outboxMessage);
  const scoped = view.kind === 'own' ? query.where(sql`lower(${outboxMessage.to}) = lower(${view.email})`) : query;
  return scoped.orderBy(desc(outboxMessage.createdAt)).limit(limit);
}

const escapeHtml = (s: string) =>
  s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);

/** A plain message with one call-to-action link, as text and HTML. */
export function linkMessage(to: string, subject: string, lines: string[], linkLabel: string, url: string): MailMessage {
  const text = [...lines, '', `${linkLabel}: ${url}`, '', '— Baudbook'].join('\n');
  const html = [
    ...lines.map((l) => `<p>${escapeHtml(l)}</p>`),
    `<p><a href="${escapeHtml(url)}">${escapeHtml(linkLabel)}</a></p>`,
    `<p style="color:#666">${escapeHtml(url)}</p>`,
  ].join('\n');
  return { to, subject, text, html };
}
