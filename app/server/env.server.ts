/**
 * The process environment, parsed once with zod. Every setting of the app is listed
 * here and in .env.example. The launcher scripts (npm start, npm test, npm run dev)
 * fill DATABASE_URL, SESSION_SECRET and APP_URL for the private demo set-up when they
 * are unset (scripts/local-env.ts).
 */
import { z } from 'zod'

/** An unset variable and an empty one (`APP_URL=` in a .env file) mean the same. */
const unsetIfEmpty = (v: unknown) => (v === '' ? undefined : v)

const EnvSchema = z
  .object({
    NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
    DATABASE_URL: z.string().url({ message: 'DATABASE_URL must be a postgres:// URL' }),
    /** Comma-separated; the first signs new cookies, the others still verify (rotation). */
    SESSION_SECRET: z.string().min(16, 'SESSION_SECRET must be at least 16 characters'),
    /**
     * Public base URL used in links inside e-mails (resets, invitations, grade releases).
     * Required in production; links are never built from the request's Host header.
     */
    APP_URL: z.preprocess(
      unsetIfEmpty,
      z
        .string()
        .url({ message: 'APP_URL must be a full http:// or https:// URL, e.g. https://cyclewright.example.org' })
        .refine((v) => /^https?:\/\//i.test(v), { message: 'APP_URL must start with http:// or https://' })
        .optional(),
    ),
    /** smtp:// or smtps:// URL of a real mail relay. When unset the local fake is used. */
    SMTP_URL: z.string().optional(),
    FAKE_SMTP_PORT: z.coerce.number().int().min(1).max(65535).default(2526),
    MAIL_FROM: z.string().default('Cyclewright <no-reply@cyclewright.invalid>'),
    /**
     * Sign-in throttling (rate-limit.server.ts). Free failures per (e-mail, client address)
     * pair; after them each further failure of the pair doubles the wait (2 s, 4 s, …), at
     * most SIGNIN_WINDOW_MINUTES.
     */
    SIGNIN_MAX_ATTEMPTS: z.coerce.number().int().min(1).default(5),
    SIGNIN_WINDOW_MINUTES: z.coerce.number().int().min(1).default(15),
    /** Failures from one client address, across accounts, per window (a lab shares one address). */
    SIGNIN_ADDRESS_MAX_FAILURES: z.coerce.number().int().min(1).default(50),
    /** Failures for one account, across addresses, per window, past which it waits for everyone. */
    SIGNIN_ACCOUNT_MAX_FAILURES: z.coerce.number().int().min(1).default(100),
    /** Password-reset requests per hour, per e-mail address and per client address. */
    RESET_MAX_PER_EMAIL: z.coerce.number().int().min(1).default(3),
    RESET_MAX_PER_ADDRESS: z.coerce.number().int().min(1).default(20),
    SESSION_DAYS: z.coerce.number().int().min(1).default(14),
    /**
     * How many proxies (load balancers) stand in front of the app and append to
     * X-Forwarded-For: the client's address is read that many hops from the right. 0 (or
     * false): none, the socket's address. 'true' means 1, kept for old settings.
     */
    TRUST_PROXY: z
      .string()
      .trim()
      .regex(/^(\d{1,2}|true|false)$/i, {
        message: 'TRUST_PROXY must be the number of proxies in front of the app (0, 1, 2 …)',
      })
      .default('0')
      .transform((v) => (/^true$/i.test(v) ? 1 : /^false$/i.test(v) ? 0 : Number(v))),
    /** The address the web server listens on (127.0.0.1: this machine only). */
    HOST: z.string().trim().min(1).default('127.0.0.1'),
  })
  .superRefine((e, ctx) => {
    if (e.NODE_ENV === 'production' && !e.APP_URL) {
      ctx.addIssue({
        code: 'custom',
        path: ['APP_URL'],
        message:
          'APP_URL must be set in production (the public address used in e-mailed links, e.g. https://cyclewright.example.org)',
      })
    }
  })

export type Env = z.infer<typeof EnvSchema>

let cached: Env | undefined

/** Parses an environment; throws one line naming every setting that is wrong. */
export function parseEnv(source: Record<string, string | undefined>): Env {
  const parsed = EnvSchema.safeParse(source)
  if (!parsed.success) {
    // One line, so that a launcher's "Could not start …: <message>" reads as one sentence.
    const issues = parsed.error.issues.map((i) => {
      const name = i.path.join('.')
      return i.message.startsWith(name) ? i.message : `${name}: ${i.message}`
    })
    throw new Error(`The environment is not set up: ${issues.join('; ')}.`)
  }
  return parsed.data
}

export function env(): Env {
  if (cached) return cached
  cached = parseEnv(process.env)
  return cached
}

/** Forgets the parsed environment, so the next env() reads process.env again (tests). */
export function resetEnv() {
  cached = undefined
}

/**
 * The base of every link the app e-mails: APP_URL, without a trailing slash. Never taken
 * from the request (a forged Host or X-Forwarded-Host would put an attacker's site in a
 * reset link). Without APP_URL (development and tests only; production refuses to start)
 * it is the local server the launchers start.
 */
export function appUrl(): string {
  const configured = env().APP_URL
  if (configured) return configured.replace(/\/+$/, '')
  return `http://127.0.0.1:${process.env.PORT ?? 3000}`
}
