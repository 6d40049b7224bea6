import { z } from "zod";

/**
 * Server environment, validated once. Every setting has a default that works on a fresh
 * machine; production deployments override them (see README, "Configuration").
 */
const EnvSchema = z
  .object({
    DATABASE_URL: z
      .string()
      .default("file:data/recurra.db")
      .refine((u) => /^(file|libsql|http|https|ws|wss):/.test(u), {
        message: "DATABASE_URL must be a file:, libsql:, http(s): or ws(s): URL",
      }),
    DATABASE_AUTH_TOKEN: z.string().optional(),
    /**
     * Embedded replica: with a file: DATABASE_URL, the libSQL server (libsql:, http(s):) the file
     * is a replica of. Reads are served from the file; writes go to the server.
     */
    DATABASE_SYNC_URL: z
      .string()
      .refine((u) => /^(libsql|http|https|ws|wss):/.test(u), {
        message: "DATABASE_SYNC_URL must be a libsql:, http(s): or ws(s): URL",
      })
      .optional(),
    /** Seconds between background syncs of an embedded replica (it also syncs after each write). */
    DATABASE_SYNC_INTERVAL: z.coerce.number().positive().default(5),
    /** Folder for uploads and, in demo mode, the generated auth secret. */
    RECURRA_DATA_DIR: z.string().default("data"),
    /** "1" turns on demo mode: demo accounts listed on the sign-in page. */
    RECURRA_DEMO: z
      .enum(["0", "1", "true", "false"])
      .default("0")
      .transform((v) => v === "1" || v === "true"),
    NEXTAUTH_SECRET: z.string().min(16).optional(),
    /** Session lifetime in seconds (default: one working shift of 8 hours). */
    RECURRA_SESSION_SECONDS: z.coerce
      .number()
      .int()
      .positive()
      .default(8 * 60 * 60),
    SMTP_URL: z.string().optional(),
    MAIL_FROM: z.string().default("Recurra <no-reply@recurra.example>"),
  })
  .refine((env) => !env.DATABASE_SYNC_URL || env.DATABASE_URL.startsWith("file:"), {
    path: ["DATABASE_SYNC_URL"],
    message:
      "an embedded replica (DATABASE_SYNC_URL) needs a file: DATABASE_URL for its local copy",
  });

export type Env = z.infer<typeof EnvSchema>;

let cached: Env | undefined;

export function getEnv(): Env {
  if (!cached) {
    const parsed = EnvSchema.safeParse(process.env);
    if (!parsed.success) {
      const lines = parsed.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`);
      throw new Error(`Invalid environment:\n${lines.join("\n")}`);
    }
    cached = parsed.data;
  }
  return cached;
}
