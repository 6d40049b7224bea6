import { createHash, randomBytes } from "node:crypto";

/**
 * Invitation tokens: 32 random bytes (256 bits) in base64url, sent only in the e-mail. The
 * database keeps the SHA-256 of the token (hex), so a copy of the database cannot be used to
 * accept an invitation.
 */

export const INVITATION_TOKEN_PATTERN = /^[A-Za-z0-9_-]{43}$/;

export function hashInvitationToken(token: string): string {
  return createHash("sha256").update(token, "utf8").digest("hex");
}

export function createInvitationToken(): { token: string; tokenHash: string } {
  const token = randomBytes(32).toString("base64url");
  return { token, tokenHash: hashInvitationToken(token) };
}

/** Default lifetime of an invitation. */
export const INVITATION_DAYS = 7;
