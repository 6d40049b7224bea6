import type { Role } from "@/db/schema/organisations";

/**
 * The demo's sign-in accounts. Kept apart from the generator so that the sign-in page can list
 * them without pulling the whole demo into its bundle. Names are invented.
 */

/** Shown on the sign-in page in demo mode only; never use it outside a demo. */
export const DEMO_PASSWORD = "recurra-demo";

export const DEMO_ORG_SLUGS = ["tidewater", "northgate"] as const;
export type DemoOrgSlug = (typeof DEMO_ORG_SLUGS)[number];

export type DemoAccount = {
  email: string;
  name: string;
  role: Role;
  organisations: DemoOrgSlug[];
};

export const DEMO_ACCOUNTS: readonly DemoAccount[] = [
  {
    email: "admin@recurra.example",
    name: "Imogen Tarrant",
    role: "admin",
    organisations: ["tidewater", "northgate"],
  },
  {
    email: "manager@recurra.example",
    name: "Desmond Achterberg",
    role: "manager",
    organisations: ["tidewater"],
  },
  {
    email: "technician@recurra.example",
    name: "Noa Brennick",
    role: "technician",
    organisations: ["northgate"],
  },
  {
    email: "shop-manager@recurra.example",
    name: "Marit Oduya",
    role: "manager",
    organisations: ["northgate"],
  },
  {
    email: "viewer@recurra.example",
    name: "Sunniva Pell",
    role: "viewer",
    organisations: ["tidewater"],
  },
];
