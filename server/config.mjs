// Every setting Baudbook reads from the environment, declared once: its variable, what it accepts, its default.
// Plain JavaScript so that server/serve.mjs (run by node before the built app is loaded) and the app
// (src/config.ts) share one copy: serve.mjs parses at start and refuses to start on a bad value, and the app
// reads the same parsed settings. astro.config.mjs reads the build-time ones with parseBuildConfig.
import { appendFileSync, existsSync, readFileSync } from 'node:fs';
import { randomBytes } from 'node:crypto';
import { isIP } from 'node:net';
import { resolve } from 'node:path';
import { z } from 'zod';
import { isLoopbackHost, plainAddress } from './peer.mjs';
import { outboxMode } from './outbox.mjs';

/**
 * A setting's zod schema with what it accepts in words: a bad value's message is
 * `NAME must be <accepts>; got "<value>".` (`hidden`: the value may hold a password and is not repeated).
 * @template {z.ZodType} T
 * @param {T} schema
 * @param {string} accepts
 * @param {{ hidden?: boolean }} [options]
 */
function setting(schema, accepts, options = {}) {
  return schema.meta({ accepts, hidden: options.hidden ?? false });
}

/** @param {number} min @param {number} max */
const wholeNumber = (min, max) => z.string().trim().regex(/^\d+$/).transform(Number).pipe(z.number().int().min(min).max(max));
const seconds = () => z.string().trim().regex(/^\d+(\.\d+)?$/).transform(Number);
/** `1`, `true`, `yes`, `on` or `0`, `false`, `no`, `off` (any case). */
const flag = () => z.stringbool();
/** @template {string} V @param {readonly [V, ...V[]]} values */
const oneOf = (values) => z.string().trim().toLowerCase().pipe(z.enum(values));
const text = () => z.string();
const path = () => z.string().trim().transform((p) => resolve(p));

/** @param {string} value @param {string[]} protocols */
function hasProtocol(value, protocols) {
  try {
    return protocols.includes(new URL(value).protocol);
  } catch {
    return false;
  }
}
/** @param {string[]} protocols */
const address = (protocols) => z.string().trim().refine((v) => hasProtocol(v, protocols));
/** A comma-separated list; empty entries are dropped. @param {(entry: string) => boolean} valid */
const list = (valid) =>
  z
    .string()
    .transform((v) => v.split(',').map((e) => e.trim()).filter(Boolean))
    .refine((entries) => entries.every(valid));

/** An origin exactly as a browser sends it in `Origin`: scheme, host and port, nothing more. @param {string} v */
function isOrigin(v) {
  try {
    const url = new URL(v);
    return (url.protocol === 'http:' || url.protocol === 'https:') && url.origin === v;
  } catch {
    return false;
  }
}

/**
 * TRUST_PROXY: how many proxies in front of this server append to X-Forwarded-For. Unset, empty, `0` or
 * `false` trusts none (the address is the socket's); `1` (or `true`) one proxy, `2` two, and so on.
 */
const proxyCount = () =>
  z
    .string()
    .trim()
    .toLowerCase()
    .regex(/^(0|false|true|[1-9]\d?)$/)
    .transform((v) => (v === 'false' ? 0 : v === 'true' ? 1 : Number(v)));

/** The longest a share link lasts, days (a rule, not a setting: SHARE_DEFAULT_DAYS stays within it). */
export const SHARE_MAX_DAYS = 365;

/**
 * The environment as Baudbook reads it: one entry per variable. An unset or blank variable takes its default.
 * The README's configuration table lists exactly these (tests/server/config.test.ts checks it).
 */
export const settingsSchema = z.object({
  // Where the server listens and what it serves (server/serve.mjs; HOST and PORT also the dev server's)
  HOST: setting(z.string().trim().regex(/^[^\s/]+$/).optional(), 'an address or host name to listen on'),
  PORT: setting(wholeNumber(1, 65535).default(4321), 'a port number (1 to 65535)'),
  DIST_DIR: setting(path().default(() => resolve('dist')), 'a folder'),
  ALLOWED_HOSTS: setting(list((h) => /^[a-z0-9*.-]+$/i.test(h)).default([]), 'comma-separated host names (no scheme, port or path)'),

  // Who is on the other end (server/serve.mjs)
  TRUST_PROXY: setting(proxyCount().default(0), 'a number of proxies (0 to 99, or true/false)'),
  PROXY_ADDRESSES: setting(list((a) => isIP(plainAddress(a)) !== 0).default([]), 'comma-separated IP addresses'),

  // Addresses and origins
  BASE_URL: setting(address(['http:', 'https:']).optional(), 'an http:// or https:// address'),
  TRUSTED_ORIGINS: setting(list(isOrigin).default([]), 'comma-separated origins such as https://baudbook.example (scheme, host and port; no path)'),

  // Database
  DATABASE_URL: setting(address(['file:', 'libsql:', 'http:', 'https:', 'ws:', 'wss:']).default('file:./data/baudbook.db'), 'a file:, libsql:, http(s): or ws(s): address', { hidden: true }),
  DATABASE_AUTH_TOKEN: setting(text().optional(), 'a token'),
  MIGRATIONS_DIR: setting(path().default(() => resolve('drizzle')), 'a folder'),

  // Sign-in and limits
  BETTER_AUTH_SECRET: setting(text().optional(), 'a secret'),
  SIGN_IN_MAX_ATTEMPTS: setting(wholeNumber(1, 1_000_000).default(5), 'a whole number of attempts (1 or more)'),
  SIGN_IN_WINDOW_SECONDS: setting(wholeNumber(1, 31_536_000).default(60), 'a whole number of seconds (1 or more)'),
  TOOLS_REQUESTS_PER_MINUTE: setting(wholeNumber(1, 1_000_000).default(120), 'a whole number of requests (1 or more)'),
  INVITATION_DAYS: setting(wholeNumber(1, 365).default(7), 'a whole number of days (1 to 365)'),
  SHARE_DEFAULT_DAYS: setting(wholeNumber(1, SHARE_MAX_DAYS).default(30), `a whole number of days (1 to ${SHARE_MAX_DAYS}, the longest a link lasts)`),

  // Mail and the local outbox (rules in server/outbox.mjs)
  SMTP_URL: setting(address(['smtp:', 'smtps:']).optional(), 'an smtp:// or smtps:// address', { hidden: true }),
  MAIL_FROM: setting(text().default('Baudbook <no-reply@baudbook.invalid>'), 'a sender address'),
  OUTBOX: setting(oneOf(['local', 'own', 'off']).optional(), 'local, own or off'),
  OUTBOX_KEY: setting(text().optional(), 'a key'),
  APP_MODE: setting(oneOf(['development', 'production']).default('development'), 'development or production'),
  SEED_DEMO: setting(flag().default(false), '1 or 0 (or true/false, yes/no, on/off)'),

  // Attachments (src/lib/server/field/)
  UPLOAD_DIR: setting(path().default(() => resolve('data/uploads')), 'a folder'),
  UPLOAD_MAX_BYTES: setting(wholeNumber(1, Number.MAX_SAFE_INTEGER).default(20 * 1024 * 1024), 'a whole number of bytes (1 or more)'),
  UPLOAD_SWEEP_INTERVAL_SECONDS: setting(seconds().default(6 * 3600), 'a number of seconds (0 or more; 0 sweeps only at start)'),
  UPLOAD_SWEEP_GRACE_SECONDS: setting(seconds().default(3600), 'a number of seconds (0 or more)'),
  S3_BUCKET: setting(text().optional(), 'a bucket name'),
  S3_ENDPOINT: setting(address(['http:', 'https:']).optional(), 'an http:// or https:// address'),
  S3_REGION: setting(text().default('us-east-1'), 'a region name'),
  S3_ACCESS_KEY_ID: setting(text().optional(), 'a key id'),
  S3_SECRET_ACCESS_KEY: setting(text().optional(), 'a secret'),
  S3_FORCE_PATH_STYLE: setting(flag().default(false), '1 or 0 (or true/false, yes/no, on/off)'),
});

/** The settings as the rest of the code reads them. */
const configSchema = settingsSchema.transform((e, ctx) => {
  const baseUrl = (e.BASE_URL ?? `http://localhost:${e.PORT}`).replace(/\/$/, '');
  let outbox;
  try {
    outbox = outboxMode({ wanted: e.OUTBOX, baseUrl, trustedHops: e.TRUST_PROXY, smtp: Boolean(e.SMTP_URL), production: e.APP_MODE === 'production' });
  } catch (err) {
    ctx.issues.push({ code: 'custom', path: ['OUTBOX'], input: e.OUTBOX, message: /** @type {Error} */ (err).message, params: { whole: true } });
    return z.NEVER;
  }
  return {
    /** HOST as given; serve.mjs picks the default with listenHost(). */
    host: e.HOST,
    port: e.PORT,
    distDir: e.DIST_DIR,
    /** Extra host names Astro answers for (read at build time by astro.config.mjs). */
    allowedHosts: e.ALLOWED_HOSTS,
    /** How many proxies in front append to X-Forwarded-For (0: the socket's address is the client's). */
    trustProxy: e.TRUST_PROXY,
    proxyAddresses: e.PROXY_ADDRESSES,
    /** Public base URL the app is reached at (links in e-mails, auth origin checks), without a trailing slash. */
    baseUrl,
    /** Every origin a browser may use to reach this server. */
    trustedOrigins: Array.from(new Set([baseUrl, `http://localhost:${e.PORT}`, `http://127.0.0.1:${e.PORT}`, ...e.TRUSTED_ORIGINS])),
    secureCookies: baseUrl.startsWith('https://'),
    databaseUrl: e.DATABASE_URL,
    databaseAuthToken: e.DATABASE_AUTH_TOKEN,
    migrationsDir: e.MIGRATIONS_DIR,
    /** Set by loadConfig (from the environment, `.env`, or generated into `.env`); parseConfig leaves it as given. */
    authSecret: e.BETTER_AUTH_SECRET,
    /** Sign-in attempts allowed per window per client address. */
    signInLimit: { max: e.SIGN_IN_MAX_ATTEMPTS, windowSeconds: e.SIGN_IN_WINDOW_SECONDS },
    /** Public tools API: requests per minute per client address. */
    toolsRequestsPerMinute: e.TOOLS_REQUESTS_PER_MINUTE,
    invitationDays: e.INVITATION_DAYS,
    /** Default lifetime of a share link, days. */
    shareDefaultDays: e.SHARE_DEFAULT_DAYS,
    smtpUrl: e.SMTP_URL ?? null,
    mailFrom: e.MAIL_FROM,
    /** Who may read the local outbox (server/outbox.mjs, decision 007). */
    outbox,
    outboxKey: e.OUTBOX_KEY,
    production: e.APP_MODE === 'production',
    seedDemo: e.SEED_DEMO,
    /** Local folder for uploads when no S3 bucket is configured. */
    uploadDir: e.UPLOAD_DIR,
    /** Largest accepted upload, bytes. */
    uploadMaxBytes: e.UPLOAD_MAX_BYTES,
    /**
     * Sweeping stored files that no attachment row names (left by a crash between storing and recording): how
     * often, in seconds (0 = only at start), and how old a file must be before it counts as left over, so an
     * upload in flight is never taken.
     */
    uploadSweep: { intervalSeconds: e.UPLOAD_SWEEP_INTERVAL_SECONDS, graceSeconds: e.UPLOAD_SWEEP_GRACE_SECONDS },
    /** S3-compatible storage when S3_BUCKET is set; null means the local folder. */
    s3: e.S3_BUCKET
      ? {
          bucket: e.S3_BUCKET,
          endpoint: e.S3_ENDPOINT,
          region: e.S3_REGION,
          accessKeyId: e.S3_ACCESS_KEY_ID,
          secretAccessKey: e.S3_SECRET_ACCESS_KEY,
          forcePathStyle: e.S3_FORCE_PATH_STYLE,
        }
      : null,
  };
});

/** @typedef {z.output<typeof configSchema>} Config */
/** @typedef {NonNullable<Config['s3']>} S3Settings */
/** @typedef {Readonly<Config & { authSecret: string }>} LoadedConfig */

/** Bad settings, one message per line, each naming the variable and what it accepts. */
export class ConfigError extends Error {
  /** @param {string[]} problems */
  constructor(problems) {
    super(problems.join('\n'));
    this.name = 'ConfigError';
    this.problems = problems;
  }
}

/**
 * Parses the settings from an environment (unset and blank variables take their defaults). Pure: reads no file
 * and generates nothing. Throws ConfigError naming every bad variable.
 * @param {Record<string, string | undefined>} env
 * @returns {Config}
 */
export function parseConfig(env) {
  return parseWith(configSchema, env);
}

const buildSchema = settingsSchema.pick({ HOST: true, PORT: true, ALLOWED_HOSTS: true });

/**
 * The settings astro.config.mjs needs: ALLOWED_HOSTS (fixed into the build) and HOST, PORT for the dev server.
 * Only these, so the build does not depend on the running server's settings.
 * @param {Record<string, string | undefined>} env
 */
export function parseBuildConfig(env) {
  const e = parseWith(buildSchema, env);
  return { host: e.HOST, port: e.PORT, allowedHosts: e.ALLOWED_HOSTS };
}

/**
 * @template {z.ZodType} T
 * @param {T} schema
 * @param {Record<string, string | undefined>} env
 * @returns {z.output<T>}
 */
function parseWith(schema, env) {
  /** @type {Record<string, string>} */
  const given = {};
  for (const name of Object.keys(settingsSchema.shape)) {
    const value = env[name];
    if (value !== undefined && value.trim() !== '') given[name] = value;
  }
  const result = schema.safeParse(given);
  if (result.success) return result.data;
  const problems = result.error.issues.map((issue) => {
    const name = String(issue.path[0]);
    if (issue.code === 'custom' && issue.params?.whole) return issue.message;
    const meta = settingsSchema.shape[/** @type {keyof typeof settingsSchema.shape} */ (name)]?.meta();
    const accepts = meta?.accepts ?? 'valid';
    return meta?.hidden
      ? `${name} must be ${accepts}; the value given is not (not repeated here: it may hold a password).`
      : `${name} must be ${accepts}; got "${given[name]}".`;
  });
  throw new ConfigError([...new Set(problems)]);
}

/**
 * Where serve.mjs listens unless HOST is set: loopback, unless BASE_URL names a host other machines use and no
 * proxy on this host is trusted (TRUST_PROXY without PROXY_ADDRESSES means the proxy is here). A demo on one's own
 * machine is never reachable from the network by default, and behind a proxy on this host only the proxy reaches
 * the app.
 * @param {Config} config
 */
export function listenHost(config) {
  if (config.host) return config.host;
  // A local demo's links must reach it: listen on the loopback address its BASE_URL names (IPv6 or IPv4).
  const loopback = new URL(config.baseUrl).hostname === '[::1]' ? '::1' : '127.0.0.1';
  if (config.trustProxy > 0 && config.proxyAddresses.length === 0) return loopback;
  return isLoopbackHost(new URL(config.baseUrl).host) ? loopback : '0.0.0.0';
}

/**
 * Makes the libraries loaded after this call use their production builds (React renders pages several times
 * faster without its development checks), unless NODE_ENV already says otherwise. serve.mjs calls it before it
 * loads the app.
 */
export function preferProductionBuilds() {
  process.env.NODE_ENV ??= 'production';
}

const ENV_FILE = '.env';
const LOADED = Symbol.for('baudbook.config');

/**
 * The process's settings, parsed once: loads `.env` from the working directory (without overriding the
 * environment) and parses; when BETTER_AUTH_SECRET is unset, the first read of `authSecret` generates one into
 * `.env`. serve.mjs calls it at
 * start and the app's bundle (src/config.ts) gets the same object, kept on globalThis because the two load
 * separate copies of this module. Throws ConfigError.
 * @returns {LoadedConfig}
 */
export function loadConfig() {
  const store = /** @type {Record<symbol, LoadedConfig | undefined>} */ (/** @type {unknown} */ (globalThis));
  const loaded = store[LOADED];
  if (loaded) return loaded;
  if (existsSync(ENV_FILE)) process.loadEnvFile(ENV_FILE);
  const config = parseConfig(process.env);
  let secret = config.authSecret;
  // Generated on first use, so a script that signs nothing (migrations, benchmarks) leaves `.env` alone.
  const ready = deepFreeze({
    ...config,
    get authSecret() {
      return (secret ??= generateAuthSecret());
    },
  });
  store[LOADED] = ready;
  return ready;
}

/** Appends a new BETTER_AUTH_SECRET to `.env` (created with mode 600) and sets it in this process. */
function generateAuthSecret() {
  const secret = randomBytes(32).toString('base64url');
  const current = existsSync(ENV_FILE) ? readFileSync(ENV_FILE, 'utf8') : '';
  const prefix = current && !current.endsWith('\n') ? '\n' : '';
  appendFileSync(ENV_FILE, `${prefix}BETTER_AUTH_SECRET=${secret}\n`, { mode: 0o600 });
  process.env.BETTER_AUTH_SECRET = secret;
  return secret;
}

/** Freezes an object and every object in its data properties (accessors are left uncalled). @template T @param {T} value @returns {T} */
function deepFreeze(value) {
  if (value && typeof value === 'object') {
    for (const d of Object.values(Object.getOwnPropertyDescriptors(value))) if ('value' in d) deepFreeze(d.value);
    Object.freeze(value);
  }
  return value;
}
