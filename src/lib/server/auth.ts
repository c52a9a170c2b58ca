import { betterAuth } from 'better-auth';
import { drizzleAdapter } from 'better-auth/adapters/drizzle';
import { db } from '../../db/client';
import * as schema from '../../db/schema';
import { config } from '../../config';
import { CLIENT_IP_HEADER } from './client-ip';
import { linkMessage, sendMail } from './mail';
import { CONFIRM_LINK_HOURS } from '../auth/policy';

export const MIN_PASSWORD_LENGTH = 10;
/** Session lifetime and how often using it extends it, in seconds. */
export const SESSION_EXPIRES_IN = 60 * 60 * 24 * 14;
export const SESSION_UPDATE_AGE = 60 * 60 * 24;

export const auth = betterAuth({
  appName: 'Baudbook',
  baseURL: config.baseUrl,
  basePath: '/api/auth',
  secret: config.authSecret,
  trustedOrigins: config.trustedOrigins,
  database: drizzleAdapter(db, {
    provider: 'sqlite',
    schema: {
      user: schema.user,
      session: schema.session,
      account: schema.account,
      verification: schema.verification,
      rateLimit: schema.rateLimit,
    },
  }),
  emailAndPassword: {
    enabled: true,
    // Sign-up answers a registered address exactly as a new one (docs/decisions/009-sign-up-without-enumeration.md):
    // a new account signs in by the e-mailed link, and the owner of a registered address is told by e-mail.
    requireEmailVerification: true,
    onExistingUserSignUp: async ({ user }) => {
      await sendMail(
        linkMessage(
          user.email,
          'Someone tried to create a Baudbook account with your address',
          [
            `Someone tried to create a Baudbook account for ${user.email}, which already has one. Nothing was changed.`,
            'If it was you, sign in instead; if you have forgotten your password, ask for a reset link. If it was not you, ignore this message.',
          ],
          'Reset your password',
          `${config.baseUrl}/forgot-password`,
        ),
      );
    },
    minPasswordLength: MIN_PASSWORD_LENGTH,
    maxPasswordLength: 128,
    resetPasswordTokenExpiresIn: 60 * 60,
    revokeSessionsOnPasswordReset: true,
    sendResetPassword: async ({ user, url }) => {
      await sendMail(
        linkMessage(
          user.email,
          'Reset your Baudbook password',
          [`Someone asked to reset the password for ${user.email}.`, 'The link works for one hour. If it was not you, ignore this message.'],
          'Choose a new password',
          url,
        ),
      );
    },
  },
  emailVerification: {
    sendOnSignUp: true,
    // Signing in before confirming sends a fresh link (the sign-in itself is answered as a wrong password).
    sendOnSignIn: true,
    autoSignInAfterVerification: true,
    expiresIn: CONFIRM_LINK_HOURS * 3600,
    sendVerificationEmail: async ({ user, url }) => {
      await sendMail(
        linkMessage(
          user.email,
          'Confirm your e-mail address for Baudbook',
          [
            `Someone (we hope you) created a Baudbook account for ${user.email}.`,
            `Open the link within ${CONFIRM_LINK_HOURS} hours to confirm the address and sign in. If it was not you, ignore this message.`,
          ],
          'Confirm and sign in',
          url,
        ),
      );
    },
  },
  session: { expiresIn: SESSION_EXPIRES_IN, updateAge: SESSION_UPDATE_AGE },
  rateLimit: {
    enabled: true,
    storage: 'database',
    window: 60,
    max: 300,
    customRules: {
      '/sign-in/email': { window: config.signInLimit.windowSeconds, max: config.signInLimit.max },
      '/request-password-reset': { window: 60, max: 5 },
      '/sign-up/email': { window: 60, max: 20 },
    },
  },
  advanced: {
    useSecureCookies: config.secureCookies,
    ipAddress: { ipAddressHeaders: [CLIENT_IP_HEADER] },
    defaultCookieAttributes: { httpOnly: true, sameSite: 'lax', secure: config.secureCookies },
  },
  telemetry: { enabled: false },
});

export type AuthSession = typeof auth.$Infer.Session;

/** Creates an account whose address needs no confirmation: demo and benchmark data only. */
export async function createConfirmedUser(email: string, name: string, password: string): Promise<string> {
  const ctx = await auth.$context;
  const created = await ctx.internalAdapter.createUser({ email: email.toLowerCase(), name, emailVerified: true }, { method: 'email-password' });
  await ctx.internalAdapter.linkAccount({ userId: created.id, providerId: 'credential', accountId: created.id, password: await ctx.password.hash(password) });
  return created.id;
}
