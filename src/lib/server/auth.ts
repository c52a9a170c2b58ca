import { betterAuth } from 'better-auth';
import { drizzleAdapter } from 'better-auth/adapters/drizzle';
import { db } from '../../db/client';
import * as schema from '../../db/schema';
import { authSecret, baseUrl, secureCookies, signInLimit, trustedOrigins } from './config';
import { CLIENT_IP_HEADER } from './client-ip';
import { linkMessage, sendMail } from './mail';

export const MIN_PASSWORD_LENGTH = 10;
/** Session lifetime and how often using it extends it, in seconds. */
export const SESSION_EXPIRES_IN = 60 * 60 * 24 * 14;
export const SESSION_UPDATE_AGE = 60 * 60 * 24;

export const auth = betterAuth({
  appName: 'Baudbook',
  baseURL: baseUrl,
  basePath: '/api/auth',
  secret: authSecret,
  trustedOrigins,
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
  session: { expiresIn: SESSION_EXPIRES_IN, updateAge: SESSION_UPDATE_AGE },
  rateLimit: {
    enabled: true,
    storage: 'database',
    window: 60,
    max: 300,
    customRules: {
      '/sign-in/email': { window: signInLimit.windowSeconds, max: signInLimit.max },
      '/request-password-reset': { window: 60, max: 5 },
      '/sign-up/email': { window: 60, max: 20 },
    },
  },
  advanced: {
    useSecureCookies: secureCookies,
    ipAddress: { ipAddressHeaders: [CLIENT_IP_HEADER] },
    defaultCookieAttributes: { httpOnly: true, sameSite: 'lax', secure: secureCookies },
  },
  telemetry: { enabled: false },
});

export type AuthSession = typeof auth.$Infer.Session;
