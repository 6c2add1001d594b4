import "server-only";
import { z } from "zod";
import { isLoopbackUrl, originPolicyFromEnv } from "./origins";
import { parseByteSize } from "@/engine/cli-support";
import { DEFAULT_MAX_SOLVE_BYTES } from "@/engine/system/estimate";
import { DEFAULT_PART_CACHE_BYTES } from "@/engine/system/parts";

/** A memory size as people write it ("2GiB", "512MB", bytes), or the fallback when unset. */
const byteSize = (name: string, fallback: number) =>
  z
    .string()
    .optional()
    .transform((value, ctx) => {
      if (value === undefined || value.trim() === "") return fallback;
      try {
        return parseByteSize(value, name);
      } catch (error) {
        ctx.addIssue({ code: "custom", message: error instanceof Error ? error.message : String(error) });
        return z.NEVER;
      }
    });

// Read once; every other module calls getEnv() instead of touching process.env.
const optionalFlag = z
  .enum(["1", "0", "true", "false", "yes", "no", "on", "off", ""])
  .optional()
  .transform((value) => (value === undefined || value === "" ? undefined : value === "1" || value === "true" || value === "yes" || value === "on"));

const flag = (fallback: boolean) =>
  z
    .enum(["1", "0", "true", "false", "yes", "no", "on", "off", ""])
    .optional()
    .transform((value) => {
      if (value === undefined || value === "") return fallback;
      return value === "1" || value === "true" || value === "yes" || value === "on";
    });

/** Validate an environment (process.env in the app; any record in tests). Throws naming each bad variable. */
export function parseEnv(raw: Record<string, string | undefined>) {
  const isProduction = raw.NODE_ENV === "production";
  const schema = z.object({
    NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
    DATABASE_URL: z
      .string()
      .default("file:data/portolan.db")
      .refine((url) => /^(file:|libsql:|https?:|wss?:)/.test(url), {
        message: "DATABASE_URL must start with file:, libsql:, http(s): or ws(s):",
      }),
    DATABASE_AUTH_TOKEN: z.string().optional(),
    SMTP_URL: z.string().optional(),
    SMTP_FROM: z.string().default("Portolan <no-reply@portolan.example>"),
    FAKE_SMTP: flag(!(isProduction && Boolean(raw.SMTP_URL))),
    FAKE_SMTP_PORT: z.coerce.number().int().min(0).max(65535).default(2525),
    OUTBOX_ENABLED: flag(!isProduction),
    APP_URL: z.string().url().optional(),
    APP_ORIGIN: z.string().url().optional(),
    COOKIE_SECURE: flag(isProduction),
    SIGNUP_MODE: z.enum(["open", "invite"]).default("open"),
    // Unset: seed the demo only when APP_URL is a loopback address (a newcomer's machine).
    SEED_DEMO: optionalFlag,
    // Jobs (lib/server/jobs): the size limit of one solve, the time limit of one job, the worker threads,
    // the parsed-part cache of each thread, runs kept per check and revision, and the optional queue.
    MAX_SOLVE_MEMORY: byteSize("MAX_SOLVE_MEMORY", DEFAULT_MAX_SOLVE_BYTES),
    JOB_TIME_LIMIT_SECONDS: z.coerce.number().positive().max(86_400).default(60),
    JOB_THREADS: z.coerce.number().int().min(1).max(64).optional(),
    PART_CACHE_SIZE: byteSize("PART_CACHE_SIZE", DEFAULT_PART_CACHE_BYTES),
    RUNS_KEPT: z.coerce.number().int().min(1).max(1000).default(3),
    REDIS_URL: z
      .string()
      .optional()
      .transform((value) => (value === undefined || value.trim() === "" ? undefined : value.trim()))
      .refine((value) => value === undefined || /^rediss?:\/\//.test(value), { message: "REDIS_URL must start with redis:// or rediss://" }),
    TRUST_PROXY: z
      .string()
      .optional()
      .transform((value, ctx) => {
        if (value === undefined || value.trim() === "" || value === "false" || value === "0") return 0;
        if (value === "true") return 1;
        const hops = Number(value);
        if (!Number.isInteger(hops) || hops < 0 || hops > 10) {
          ctx.addIssue({ code: "custom", message: "TRUST_PROXY must be the number of proxies in front of the app (0-10)" });
          return z.NEVER;
        }
        return hops;
      }),
  });
  const parsed = schema.safeParse(raw);
  if (!parsed.success) {
    const problems = parsed.error.issues.map((issue) => `${issue.path.join(".")}: ${issue.message}`);
    throw new Error(`Invalid environment: ${problems.join("; ")}`);
  }
  const value = parsed.data;
  const appUrl = (value.APP_URL ?? value.APP_ORIGIN ?? "http://localhost:3000").replace(/\/+$/, "");
  const localAppUrl = isLoopbackUrl(appUrl);
  return {
    nodeEnv: value.NODE_ENV,
    isProduction: value.NODE_ENV === "production",
    databaseUrl: value.DATABASE_URL,
    databaseAuthToken: value.DATABASE_AUTH_TOKEN,
    smtpUrl: value.SMTP_URL ?? `smtp://127.0.0.1:${value.FAKE_SMTP_PORT}`,
    smtpFrom: value.SMTP_FROM,
    fakeSmtp: value.FAKE_SMTP,
    fakeSmtpPort: value.FAKE_SMTP_PORT,
    outboxEnabled: value.OUTBOX_ENABLED,
    appUrl,
    /** Extra origin accepted for state-changing requests besides the request's own Host. */
    appOrigin: value.APP_ORIGIN ? new URL(value.APP_ORIGIN).origin : value.APP_URL ? new URL(value.APP_URL).origin : null,
    /** Who may send state-changing requests (see lib/base/origins.ts isAllowedOrigin). */
    originPolicy: originPolicyFromEnv({ APP_URL: value.APP_URL, APP_ORIGIN: value.APP_ORIGIN, TRUST_PROXY: String(value.TRUST_PROXY) }),
    /** Proxies in front of the app whose X-Forwarded-* headers are believed (TRUST_PROXY). */
    trustProxyHops: value.TRUST_PROXY,
    cookieSecure: value.COOKIE_SECURE,
    signupMode: value.SIGNUP_MODE,
    seedDemo: value.SEED_DEMO ?? localAppUrl,
    /** SEED_DEMO=1 on an address others can reach: the log warns and every page shows a banner. */
    demoOnPublicAddress: value.SEED_DEMO === true && !localAppUrl,
    /** bytes a solve may take by the engine's estimate (MAX_SOLVE_MEMORY; 422 above it) */
    maxSolveBytes: value.MAX_SOLVE_MEMORY,
    /** milliseconds one job may run before it is cancelled (JOB_TIME_LIMIT_SECONDS) */
    jobTimeLimitMs: value.JOB_TIME_LIMIT_SECONDS * 1000,
    /** worker threads of the job pool (JOB_THREADS; default: cores − 1, at least 1) */
    jobThreads: value.JOB_THREADS,
    /** byte cap of each worker's parsed-part cache (PART_CACHE_SIZE) */
    partCacheBytes: value.PART_CACHE_SIZE,
    /** check runs kept per (scenario, check, revision) besides pinned ones (RUNS_KEPT) */
    runsKept: value.RUNS_KEPT,
    /** long jobs go through BullMQ on this Redis when set (REDIS_URL) */
    redisUrl: value.REDIS_URL,
  };
}

export type Env = ReturnType<typeof parseEnv>;

let cached: Env | null = null;

/** The validated environment, read on first use. */
export function getEnv(): Env {
  cached ??= parseEnv(process.env);
  return cached;
}
