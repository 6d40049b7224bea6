import { defineConfig } from "drizzle-kit";

export default defineConfig({
  dialect: "turso",
  schema: "./db/schema/index.ts",
  out: "./db/migrations",
  dbCredentials: {
    url: process.env.DATABASE_URL ?? "file:data/recurra.db",
    authToken: process.env.DATABASE_AUTH_TOKEN,
  },
  strict: true,
  verbose: false,
});
