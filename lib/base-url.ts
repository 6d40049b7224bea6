import "server-only";
import { headers } from "next/headers";
import { getConfiguredBaseUrl } from "./env";

/**
 * Base URL for links in e-mail: RECURRA_BASE_URL, else NEXTAUTH_URL, else the address the
 * current request came to (fine for a demo on one machine; set one of the two in production).
 */
export async function getBaseUrl(): Promise<string> {
  const configured = getConfiguredBaseUrl();
  if (configured) return configured;
  const h = await headers();
  const host = h.get("x-forwarded-host") ?? h.get("host") ?? "localhost:3000";
  const proto =
    h.get("x-forwarded-proto") ?? (/^(localhost|127\.|\[::1\])/.test(host) ? "http" : "https");
  return `${proto}://${host}`;
}
