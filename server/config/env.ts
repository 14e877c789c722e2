import { z } from 'zod';

/**
 * The server's whole configuration, parsed once at start-up. Nothing else reads process.env:
 * a missing or malformed key stops the process with every problem listed at once.
 */
const EnvSchema = z
  .object({
    NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
    HOST: z.string().default('127.0.0.1'),
    PORT: z.coerce.number().int().min(1).max(65535).default(3000),
    DATABASE_URL: z.string().url().default('postgres://postgres@127.0.0.1:54329/tractwise'),
    SESSION_SECRET: z.string().min(16).default('local-development-session-secret'),
    SESSION_IDLE_MINUTES: z.coerce.number().int().min(5).max(7 * 24 * 60).default(8 * 60),
    /** 'auto' marks the cookie Secure whenever the request arrived over HTTPS (directly or via a trusted proxy). */
    COOKIE_SECURE: z.enum(['auto', 'true', 'false']).default('auto'),
    TRUST_PROXY: z.coerce.number().int().min(0).default(0),
    CLIENT_DIST: z.string().default('dist/client'),
    /** Optional PMTiles archive of the company's region; without it the demo town basemap is served. */
    BASEMAP_PMTILES: z.string().optional(),
    BASEMAP_ATTRIBUTION: z.string().default('Demo town: invented data'),
    LOG_LEVEL: z.enum(['debug', 'info', 'warn', 'error', 'silent']).default('info'),
    /** Street-range batch geocoder (CSV batch protocol); npm start and the tests run a local fake on loopback. */
    GEOCODER_URL: z.string().url().default('http://127.0.0.1:3101/geocode'),
    /** Largest CSV file an import accepts, in bytes (default 32 MiB). */
    IMPORT_MAX_BYTES: z.coerce.number().int().min(1024).default(32 * 1024 * 1024),
    /** Most data rows one import accepts. */
    IMPORT_MAX_ROWS: z.coerce.number().int().min(1).default(200_000),
    /** Outgoing mail (quotes, homeowner results); npm start and the tests run a local SMTP fake on loopback. */
    SMTP_URL: z.string().url().default('smtp://127.0.0.1:2525'),
    MAIL_FROM: z.string().min(3).default('Tractwise <no-reply@tractwise.invalid>'),
    /**
     * S3-compatible object storage for photos and lab reports (path-style requests). The bucket is
     * private: files reach users only through the API. npm start and the tests run a local fake on loopback.
     */
    S3_ENDPOINT: z.string().url().default('http://127.0.0.1:4569'),
    S3_BUCKET: z.string().min(3).max(63).default('tractwise'),
    S3_REGION: z.string().min(1).default('us-east-1'),
    S3_ACCESS_KEY_ID: z.string().min(1).default('S3RVER'),
    S3_SECRET_ACCESS_KEY: z.string().min(1).default('S3RVER'),
  })
  .superRefine((env, ctx) => {
    if (env.NODE_ENV === 'production' && env.SESSION_SECRET === 'local-development-session-secret') {
      ctx.addIssue({ code: 'custom', path: ['SESSION_SECRET'], message: 'set a secret of your own in production' });
    }
  });

export type Env = z.infer<typeof EnvSchema>;

export function parseEnv(source: Record<string, string | undefined>): Env {
  const result = EnvSchema.safeParse(source);
  if (!result.success) {
    const lines = result.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
    throw new Error(`Invalid configuration:\n${lines.join('\n')}`);
  }
  return result.data;
}

let cached: Env | undefined;
export function env(): Env {
  cached ??= parseEnv(process.env);
  return cached;
}
