import { randomBytes } from "node:crypto";
import { mkdirSync, readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { getEnv } from "@/lib/env";

let cached: string | undefined;

/**
 * The key that signs session tokens. NEXTAUTH_SECRET wins; without it (demo, first run) a
 * random secret is generated once into the data folder and reused, so sessions survive a
 * restart. Several web nodes must share NEXTAUTH_SECRET (README, "Configuration").
 */
export function getAuthSecret(): string {
  if (cached) return cached;
  const env = getEnv();
  if (env.NEXTAUTH_SECRET) return (cached = env.NEXTAUTH_SECRET);
  const file = join(env.RECURRA_DATA_DIR, "auth-secret");
  try {
    cached = readFileSync(file, "utf8").trim();
    if (cached.length >= 32) return cached;
  } catch {
    // first run: fall through and create it
  }
  mkdirSync(env.RECURRA_DATA_DIR, { recursive: true });
  cached = randomBytes(32).toString("hex");
  writeFileSync(file, `${cached}\n`, { mode: 0o600 });
  console.warn(`[recurra] NEXTAUTH_SECRET is not set: generated one in ${file}.`);
  return cached;
}
