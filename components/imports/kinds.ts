import type { ImportKind } from "@/db/schema/operations";

/** The data kinds in the user's words, in the order the upload form lists them. */
export const KIND_LABELS: Record<ImportKind, string> = {
  repairs: "Repair orders (one row per repair line)",
  faults: "Fault-code events",
  fuel: "Fuel-card transactions",
  vehicles: "Vehicle roster",
  parts: "Parts and stock",
  generations: "Generation catalogue",
};

export const KIND_ORDER = Object.keys(KIND_LABELS) as ImportKind[];

export const STATUS_LABELS: Record<string, string> = {
  uploaded: "Waiting for column mapping",
  queued: "Waiting for a worker",
  reading: "Reading and checking rows",
  applying: "Adding to your data",
  done: "Imported",
  failed: "Failed",
  cancelled: "Cancelled",
  undone: "Undone",
};

export const ACTIVE_STATUSES = new Set(["queued", "reading", "applying"]);
