/** The organisation and admin of confidence.spec.ts (seed-confidence-org.ts creates them). */
export const CONFIDENCE_ORG = { slug: "tidewater-confidence", name: "Tidewater Confidence Check" };
export const CONFIDENCE_ADMIN = "confidence-admin@recurra.example";
