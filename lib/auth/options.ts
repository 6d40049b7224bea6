import "server-only";
import type { AuthOptions } from "next-auth";
import CredentialsProvider from "next-auth/providers/credentials";
import { z } from "zod";
import { getDb } from "@/db";
import { findActiveUserByEmail, listMembershipsOfUser } from "@/db/queries/accounts";
import { getEnv } from "@/lib/env";
import { DUMMY_HASH, verifyPassword } from "./password";
import { getAuthSecret } from "./secret";

const Credentials = z.object({
  email: z.string().trim().toLowerCase().email().max(254),
  password: z.string().min(1).max(200),
});

const SwitchOrganisation = z.object({ organisationId: z.number().int().positive() });

declare module "next-auth" {
  interface Session {
    userId: number;
    organisationId: number | null;
  }
}
declare module "next-auth/jwt" {
  interface JWT {
    uid?: number;
    oid?: number | null;
  }
}

/**
 * next-auth configuration: e-mail + password, JWT sessions holding the user and the active
 * organisation. The role is NOT trusted from the token: the server guard reads the membership
 * from the database on every request, so a changed or removed membership takes effect at once.
 */
export function getAuthOptions(): AuthOptions {
  return {
    secret: getAuthSecret(),
    session: { strategy: "jwt", maxAge: getEnv().RECURRA_SESSION_SECONDS, updateAge: 15 * 60 },
    pages: { signIn: "/sign-in", error: "/sign-in" },
    logger: {
      // An expired or tampered session token is routine: one line, no stack trace.
      error(code, metadata) {
        if (code === "JWT_SESSION_ERROR")
          console.warn("[recurra] session token rejected (expired or invalid)");
        else console.error(`[next-auth] ${code}`, metadata);
      },
      warn(code) {
        if (code !== "NEXTAUTH_URL") console.warn(`[next-auth] ${code}`);
      },
      debug() {},
    },
    providers: [
      CredentialsProvider({
        name: "Recurra account",
        credentials: { email: { type: "email" }, password: { type: "password" } },
        async authorize(raw) {
          const parsed = Credentials.safeParse(raw);
          if (!parsed.success) return null;
          const user = await findActiveUserByEmail(await getDb(), parsed.data.email);
          // Compare against a dummy hash for unknown users so both failures take equally long.
          const isValid = await verifyPassword(
            parsed.data.password,
            user?.passwordHash ?? DUMMY_HASH,
          );
          if (!user || !isValid) return null;
          return { id: String(user.id), email: user.email, name: user.name };
        },
      }),
    ],
    callbacks: {
      async jwt({ token, user, trigger, session }) {
        if (user) {
          const uid = Number(user.id);
          const { memberships } = await listMembershipsOfUser(await getDb(), uid);
          token.uid = uid;
          token.oid = memberships[0]?.organisationId ?? null;
        }
        if (trigger === "update" && token.uid) {
          const wanted = SwitchOrganisation.safeParse(session);
          if (wanted.success) {
            const { memberships } = await listMembershipsOfUser(await getDb(), token.uid);
            // Only an organisation the user belongs to can become the active one.
            if (memberships.some((m) => m.organisationId === wanted.data.organisationId)) {
              token.oid = wanted.data.organisationId;
            }
          }
        }
        return token;
      },
      async session({ session, token }) {
        session.userId = token.uid ?? 0;
        session.organisationId = token.oid ?? null;
        return session;
      },
    },
  };
}
