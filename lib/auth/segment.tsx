import "server-only";
import { requirePage } from "./guard";
import type { Capability } from "./roles";

/**
 * A route segment's layout that lets only roles with `capability` in. It runs outside the
 * segment's loading boundary, so a refusal is answered with a real 403 status before any
 * part of the page streams (a check inside a suspended page can no longer change the status).
 * Pages still call requirePage themselves; the guard is cached per request.
 */
export function capabilityLayout(capability: Capability) {
  return async function CapabilityLayout({ children }: { children: React.ReactNode }) {
    await requirePage(capability);
    return children;
  };
}
