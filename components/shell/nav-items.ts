import type { Capability } from "@/lib/auth/roles";

/** Every screen of the product, with the capability a role needs to see it. */
export const NAV_ITEMS: { href: string; label: string; capability: Capability }[] = [
  { href: "/", label: "Home", capability: "dashboard:read" },
  { href: "/patterns", label: "Patterns", capability: "patterns:read" },
  { href: "/known-issues", label: "Known issues", capability: "known-issues:read" },
  { href: "/lookup", label: "Lookup", capability: "lookup:use" },
  { href: "/vehicles", label: "Vehicles", capability: "vehicles:read" },
  { href: "/refuel", label: "Refuel analysis", capability: "refuel:read" },
  { href: "/at-risk", label: "At risk", capability: "campaigns:manage" },
  { href: "/comebacks", label: "Comebacks", capability: "comebacks:read" },
  { href: "/stocking", label: "Stocking", capability: "stocking:read" },
  { href: "/parts", label: "Parts", capability: "parts:manage" },
  { href: "/imports", label: "Imports", capability: "imports:read" },
  { href: "/settings", label: "Settings", capability: "settings:manage" },
];
