/**
 * The process environment, parsed once with zod. Every setting of the app is listed
 * here and in .env.example. The launcher scripts (npm start, npm test, npm run dev)
 * fill DATABASE_URL and SESSION_SECRET for the private demo set-up when they are unset.
 */
import { z } from 'zod'

const EnvSchema = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  DATABASE_URL: z.string().url({ message: 'DATABASE_URL must be a postgres:// URL' }),
  /** Comma-separated; the first signs new cookies, the others still verify (rotation). */
  SESSION_SECRET: z.string().min(16, 'SESSION_SECRET must be at least 16 characters'),
  /** Public base URL used in links inside e-mails. */
  APP_URL: z.string().url().optional(),
  /** smtp:// or smtps:// URL of a real mail relay. When unset the local fake is used. */
  SMTP_URL: z.string().optional(),
  FAKE_SMTP_PORT: z.coerce.number().int().min(1).max(65535).default(2526),
  MAIL_FROM: z.string().default('Cyclewright <no-reply@cyclewright.invalid>'),
  /** Sign-in rate limit: attempts allowed per e-mail and per client address in the window. */
  SIGNIN_MAX_ATTEMPTS: z.coerce.number().int().min(1).default(5),
  SIGNIN_WINDOW_MINUTES: z.coerce.number().int().min(1).default(15),
  SESSION_DAYS: z.coerce.number().int().min(1).default(14),
  /** Set when the app sits behind a load balancer that sets X-Forwarded-For. */
  TRUST_PROXY: z
    .enum(['0', '1', 'true', 'false'])
    .default('0')
    .transform((v) => v === '1' || v === 'true'),
})

export type Env = z.infer<typeof EnvSchema>

let cached: Env | undefined

export function env(): Env {
  if (cached) return cached
  const parsed = EnvSchema.safeParse(process.env)
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`)
    throw new Error(`The environment is not set up:\n${lines.join('\n')}`)
  }
  cached = parsed.data
  return cached
}

export function appUrl(request?: Request): string {
  const configured = env().APP_URL
  if (configured) return configured.replace(/\/$/, '')
  if (request) return new URL(request.url).origin
  return `http://127.0.0.1:${process.env.PORT ?? 3000}`
}
