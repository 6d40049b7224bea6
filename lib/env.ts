import { z } from "zod";

/**
 * Server environment, validated once. Every setting has a default that works on a fresh
 * machine; production deployments override them (see README, "Configuration").
 */
const EnvSchema = z.object({
  DATABASE_URL: z
    .string()
    .default("file:data/recurra.db")
    .refine((u) => /^(file|libsql|http|https|ws|wss):/.test(u), {
      message: "DATABASE_URL must be a file:, libsql:, http(s): or ws(s): URL",
    }),
  DATABASE_AUTH_TOKEN: z.string().optional(),
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
