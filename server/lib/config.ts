/**
 * Configuration from the environment, zod-parsed once at start-up. A bad value stops the process
 * with every offending key listed (ConfigError), never halfway through a request.
 */
import { randomBytes } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { z } from 'zod';

const optionalText = z
  .string()
  .trim()
  .transform((v) => (v === '' ? undefined : v))
  .optional();

const port = (fallback: number) => z.coerce.number().int().min(0).max(65535).default(fallback);

export const EnvSchema = z.object({
  NODE_ENV: z.enum(['development', 'test', 'production']).default('development'),
  PORT: port(5180),
  HOST: z.string().trim().min(1).default('127.0.0.1'),
  DATABASE_URL: optionalText.pipe(z.url({ protocol: /^postgres(ql)?$/, message: 'Must be a postgres:// URL.' }).optional()),
  FRINGEWALK_PG_PORT: port(5433),
  FRINGEWALK_DATA_DIR: z.string().trim().min(1).default('.data'),
  SMTP_URL: optionalText.pipe(z.url({ protocol: /^smtps?$/, message: 'Must be an smtp:// or smtps:// URL.' }).optional()),
  /** Port of the local mail capture when SMTP_URL is unset; 0 lets the kernel choose. */
  FRINGEWALK_SMTP_CAPTURE_PORT: port(0),
  MAIL_FROM: z.string().trim().min(3).default('Fringewalk <no-reply@fringewalk.invalid>'),
  /** The origin people open in the browser; links in e-mails point here. Defaults to http://HOST:PORT. */
  PUBLIC_URL: optionalText.pipe(z.url({ protocol: /^https?$/, message: 'Must be an http:// or https:// URL.' }).optional()),
  /** Extra origins allowed to make cookie-carrying writes (comma-separated), e.g. a Vite preview. */
  TRUSTED_ORIGINS: optionalText,
  SESSION_SECRET: optionalText.pipe(z.string().min(32, 'Use at least 32 characters.').optional()),
  /** Express "trust proxy" setting; set it when a reverse proxy terminates TLS (e.g. "1" or "loopback"). */
  TRUST_PROXY: optionalText,
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
  /** S3-compatible object store; unset starts the local fake (s3rver) on 127.0.0.1. */
  S3_ENDPOINT: optionalText.pipe(z.url({ protocol: /^https?$/, message: 'Must be an http:// or https:// URL.' }).optional()),
  S3_BUCKET: z.string().trim().min(3).max(63).regex(/^[a-z0-9][a-z0-9.-]+[a-z0-9]$/, 'Must be a valid S3 bucket name.').default('fringewalk'),
  S3_ACCESS_KEY_ID: optionalText,
  S3_SECRET_ACCESS_KEY: optionalText,
  S3_REGION: z.string().trim().min(1).default('us-east-1'),
  /** Port of the local fake S3 server when S3_ENDPOINT is unset; 0 lets the kernel choose. */
  FRINGEWALK_S3_PORT: port(0),
});
export type Env = z.infer<typeof EnvSchema>;

/** Name of the database in the project-local cluster. */
export const LOCAL_DATABASE_NAME = 'fringewalk';

export class ConfigError extends Error {
  override name = 'ConfigError';
}

export interface Config {
  env: Env;
  nodeEnv: Env['NODE_ENV'];
  port: number;
  host: string;
  databaseUrl: string | undefined;
  localPgPort: number;
  dataDir: string;
  smtpUrl: string | undefined;
  smtpCapturePort: number;
  mailFrom: string;
  publicUrl: string;
  trustedOrigins: string[];
  sessionSecret: string | undefined;
  trustProxy: string | undefined;
  logLevel: Env['LOG_LEVEL'];
  /** The object store; endpoint undefined = start the local fake. */
  s3: { endpoint: string | undefined; bucket: string; accessKeyId: string | undefined; secretAccessKey: string | undefined; region: string; localPort: number };
}

function originOf(url: string): string {
  return new URL(url).origin;
}

export function loadConfig(source: NodeJS.ProcessEnv = process.env): Config {
  const parsed = EnvSchema.safeParse(source);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((issue) => `  ${issue.path.join('.') || '(environment)'}: ${issue.message}`);
    throw new ConfigError(`The configuration is not valid:\n${lines.join('\n')}`);
  }
  const env = parsed.data;
  if (env.NODE_ENV === 'production' && !env.SESSION_SECRET) {
    throw new ConfigError('The configuration is not valid:\n  SESSION_SECRET: required when NODE_ENV=production.');
  }
  const publicUrl = (env.PUBLIC_URL ?? `http://${env.HOST.includes(':') ? `[${env.HOST}]` : env.HOST}:${env.PORT}`).replace(/\/+$/, '');
  const extra = (env.TRUSTED_ORIGINS ?? '')
    .split(',')
    .map((o) => o.trim())
    .filter(Boolean);
  const badOrigin = extra.find((o) => !URL.canParse(o));
  if (env.S3_ENDPOINT && (!env.S3_ACCESS_KEY_ID || !env.S3_SECRET_ACCESS_KEY)) {
    throw new ConfigError('The configuration is not valid:\n  S3_ACCESS_KEY_ID, S3_SECRET_ACCESS_KEY: required when S3_ENDPOINT is set.');
  }
  if (badOrigin) throw new ConfigError(`The configuration is not valid:\n  TRUSTED_ORIGINS: "${badOrigin}" is not a URL.`);
  const trustedOrigins = [...new Set([originOf(publicUrl), ...extra.map(originOf)])];
  return {
    env,
    nodeEnv: env.NODE_ENV,
    port: env.PORT,
    host: env.HOST,
    databaseUrl: env.DATABASE_URL,
    localPgPort: env.FRINGEWALK_PG_PORT,
    dataDir: path.resolve(env.FRINGEWALK_DATA_DIR),
    smtpUrl: env.SMTP_URL,
    smtpCapturePort: env.FRINGEWALK_SMTP_CAPTURE_PORT,
    mailFrom: env.MAIL_FROM,
    publicUrl,
    trustedOrigins,
    sessionSecret: env.SESSION_SECRET,
    trustProxy: env.TRUST_PROXY,
    logLevel: env.LOG_LEVEL,
    s3: {
      endpoint: env.S3_ENDPOINT,
      bucket: env.S3_BUCKET,
      accessKeyId: env.S3_ACCESS_KEY_ID,
      secretAccessKey: env.S3_SECRET_ACCESS_KEY,
      region: env.S3_REGION,
      localPort: env.FRINGEWALK_S3_PORT,
    },
  };
}

/**
 * The session secret: the configured one, or (outside production) one generated on the first start
 * and kept in the data folder, so sessions survive a restart without anyone having to set it.
 */
export function resolveSessionSecret(config: Config): string {
  if (config.sessionSecret) return config.sessionSecret;
  if (config.nodeEnv === 'production') throw new ConfigError('SESSION_SECRET is required when NODE_ENV=production.');
  const file = path.join(config.dataDir, 'session-secret');
  try {
    const existing = fs.readFileSync(file, 'utf8').trim();
    if (existing.length >= 32) return existing;
  } catch {
    // first start: fall through and create it
  }
  fs.mkdirSync(config.dataDir, { recursive: true });
  const secret = randomBytes(48).toString('base64url');
  fs.writeFileSync(file, `${secret}\n`, { mode: 0o600 });
  return secret;
}

/** Cookies get the Secure flag when the public URL is https. */
export function isHttps(publicUrl: string): boolean {
  return new URL(publicUrl).protocol === 'https:';
}
