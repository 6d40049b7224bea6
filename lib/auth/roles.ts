import type { Role } from "@/db/schema/organisations";

/**
 * What each role may do, as capabilities. Pages, route handlers, server actions and the data
 * layer all ask `can(role, capability)`; nothing compares role names directly.
 */
export const CAPABILITIES = {
  "dashboard:read": ["admin", "manager", "technician", "viewer"],
  "patterns:read": ["admin", "manager", "technician", "viewer"],
  "known-issues:read": ["admin", "manager", "technician", "viewer"],
  "known-issues:comment": ["admin", "manager", "technician"],
  "known-issues:manage": ["admin", "manager"],
  "refuel:read": ["admin", "manager", "viewer"],
  "vehicles:read": ["admin", "manager", "technician"],
  "vehicles:write": ["admin", "manager"],
  "lookup:use": ["admin", "manager", "technician"],
  "findings:record": ["admin", "manager", "technician"],
  "stocking:read": ["admin", "manager"],
  "comebacks:read": ["admin", "manager"],
  "parts:manage": ["admin", "manager"],
  "imports:read": ["admin", "manager"],
  "imports:write": ["admin", "manager"],
  "campaigns:manage": ["admin", "manager"],
  "settings:manage": ["admin"],
  "members:manage": ["admin"],
  "audit:read": ["admin"],
} as const satisfies Record<string, readonly Role[]>;

export type Capability = keyof typeof CAPABILITIES;

export function can(role: Role, capability: Capability): boolean {
  return (CAPABILITIES[capability] as readonly Role[]).includes(role);
}

export const ROLE_LABELS: Record<Role, string> = {
  admin: "Admin",
  manager: "Manager",
  technician: "Technician",
  viewer: "Viewer",
};

export const ROLE_DESCRIPTIONS: Record<Role, string> = {
  admin: "Everything in the organisation, including members and settings.",
  manager: "Imports data and manages known issues, parts, campaigns and digests.",
  technician: "Looks up vehicles, records findings, comments on known issues.",
  viewer: "Reads dashboards; changes nothing.",
};
