import nodemailer from 'nodemailer';
import { desc } from 'drizzle-orm';
import { db } from '../../db/client';
import { outboxMessage } from '../../db/schema';
import { mailFrom, smtpUrl } from './config';

export interface MailMessage {
  to: string;
  subject: string;
  text: string;
  html?: string;
}

let transport: nodemailer.Transporter | null = null;

/** Sends through SMTP when SMTP_URL is set, otherwise keeps the message in the local outbox. */
export async function sendMail(message: MailMessage): Promise<void> {
  if (smtpUrl) {
    transport ??= nodemailer.createTransport(smtpUrl);
    await transport.sendMail({ from: mailFrom, ...message });
    return;
  }
  await db.insert(outboxMessage).values({ id: crypto.randomUUID(), ...message });
}

export function listOutbox(limit = 50) {
  return db.select().from(outboxMessage).orderBy(desc(outboxMessage.createdAt)).limit(limit);
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
