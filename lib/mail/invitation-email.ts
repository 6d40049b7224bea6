import escapeHtml from "escape-html";
import { ROLE_DESCRIPTIONS, ROLE_LABELS } from "@/lib/auth/roles";
import type { Role } from "@/db/schema/organisations";

/** The invitation message, as plain text and as simple HTML (every value escaped). */
export function buildInvitationEmail(input: {
  organisationName: string;
  inviterName: string;
  role: Role;
  acceptUrl: string;
  expiresAt: string;
}): { subject: string; text: string; html: string } {
  const role = ROLE_LABELS[input.role];
  const expires = `${input.expiresAt.slice(0, 16).replace("T", " ")} UTC`;
  const subject = `Join ${input.organisationName.replace(/\s+/g, " ")} on Recurra`;
  const text = [
    `${input.inviterName} has invited you to join ${input.organisationName} on Recurra as ${role.toLowerCase()}.`,
    `${role}: ${ROLE_DESCRIPTIONS[input.role]}`,
    "",
    "Open this link to accept:",
    input.acceptUrl,
    "",
    `The link works once and until ${expires}. If you did not expect this invitation, ignore this message.`,
    "",
    "Recurra: which failures keep coming back, on which vehicles, at what mileage.",
  ].join("\n");
  const e = escapeHtml;
  const html = `<!doctype html>
<html lang="en"><body style="font-family:system-ui,sans-serif;color:#1b2a2f;line-height:1.5">
<p>${e(input.inviterName)} has invited you to join <strong>${e(input.organisationName)}</strong> on Recurra as ${e(role.toLowerCase())}.</p>
<p>${e(role)}: ${e(ROLE_DESCRIPTIONS[input.role])}</p>
<p><a href="${e(input.acceptUrl)}" style="display:inline-block;padding:8px 16px;background:#0f5e6b;color:#fff;border-radius:6px;text-decoration:none">Accept the invitation</a></p>
<p style="font-size:14px;color:#4d5f66">Or paste this address into your browser: ${e(input.acceptUrl)}<br>
The link works once and until ${e(expires)}. If you did not expect this invitation, ignore this message.</p>
</body></html>`;
  return { subject, text, html };
}
