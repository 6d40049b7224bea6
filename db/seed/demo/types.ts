import type { FaultStatus, Symptom } from "@/db/schema";
import type { ComponentSlug } from "../reference";
import type { ModelName } from "./scenario";

// --- What can go wrong ------------------------------------------------------------------------

export type PartUse = { slug: ComponentSlug; qty: number };

/** One way of repairing a fault: what the technician found and did. */
export type Repair = {
  component: ComponentSlug | null;
  causes: readonly string[];
  corrections: readonly string[];
  hours: readonly [number, number];
  parts: readonly PartUse[];
};

export type OrgKind = "fleet" | "shop";

export type FaultDef = {
  key: string;
  symptom: Symptom | null;
  /** Needs a visit the same day (road call, customer drives straight in). */
  isUrgent: boolean;
  complaints: readonly string[];
  /** DTC sets; one is drawn per occurrence. Empty when the fault sets no code. */
  codes: readonly (readonly string[])[];
  /** Share of occurrences whose codes are read and written down. */
  codeShare: number;
  fix: Repair;
  /** Background failure rate per 10,000 mi, before duty and cohort factors. */
  ratePer10k: number;
  /** Wear items: the rate climbs from a third at 0 mi to full at this odometer (and on, to 1.5×). */
  wearFullAtMi?: number;
  /** No new onset of the same fault for this many miles after one (pads do not wear out twice in a month). */
  minGapMi: number;
  /** Delivery duty multiplier (stop-start driving eats brakes and suspension). */
  fleetFactor: number;
  /** Extra multiplier per model ("Merlin") or generation ("Merlin M1"). */
  cohortFactors?: Readonly<Record<string, number>>;
  /** Chance that a repair does not hold and the vehicle comes back. */
  comebackChance: number;
  /** Wear items are never warranty work. */
  isWearItem: boolean;
  /** Covered by the longer powertrain warranty. */
  isPowertrain: boolean;
  /** Days until the complaint returns when a repair did not hold. */
  recurrenceDays: readonly [number, number];
  /** Planted patterns only: the cohort that carries the defect. */
  cohort?: { model: ModelName; generation: string };
  /** Planted patterns only: onset rate per 10,000 mi at an odometer, replacing ratePer10k. */
  rateAt?: (odometerMi: number) => number;
  /** Plausible first repairs that miss the real cause (then the vehicle comes back). */
  wrongFixes?: readonly Repair[];
  wrongFixChance?: number;
  /** "refuel": each occurrence happens a few miles after a fill-up (fleet with fuel data). */
  trigger: "time" | "refuel";
  /** Share of a customer's occurrences that reach the shop (the rest go elsewhere or wait). */
  shopCapture: number;
};

// --- What the generator produces (keyed by VIN, not by database id) ---------------------------

export type DemoVehicle = {
  vin: string;
  unitNumber: string | null;
  make: string;
  model: ModelName;
  modelYear: number;
  engine: string;
  transmission: string;
  inServiceDate: string;
  generationLabel: string | null;
  lastOdometerMi: number | null;
  lastOdometerOn: string | null;
};

export type DemoRepairLine = {
  lineNo: number;
  complaint: string;
  cause: string;
  correction: string;
  dtcCodes: string[];
  componentSlug: ComponentSlug | null;
  symptom: Symptom | null;
  laborHours: number;
  partsCostCents: number;
  laborCostCents: number;
  partNumbers: string[];
  technician: string | null;
  vendor: string | null;
  isWarranty: boolean;
};

export type DemoRepairOrder = {
  vin: string;
  roNumber: string;
  openedOn: string;
  closedOn: string;
  odometerMi: number;
  vendor: string | null;
  lines: DemoRepairLine[];
};

export type DemoFaultEvent = {
  vin: string;
  occurredAt: string;
  odometerMi: number;
  dtc: string;
  milOn: boolean;
  status: FaultStatus;
};

export type DemoFuelTransaction = {
  vin: string;
  filledAt: string;
  odometerMi: number | null;
  volumeL: number;
  priceTotalCents: number;
  station: string;
};

export type DemoPart = {
  partNumber: string;
  description: string;
  componentSlug: ComponentSlug;
  onHand: number;
  unitCostCents: number;
  leadTimeDays: number;
};

export type DemoGeneration = {
  make: string;
  model: string;
  label: string;
  yearFrom: number;
  yearTo: number;
};

export type DemoOrganisation = {
  slug: string;
  name: string;
  kind: OrgKind;
  generations: DemoGeneration[];
  vehicles: DemoVehicle[];
  repairOrders: DemoRepairOrder[];
  faultEvents: DemoFaultEvent[];
  fuelTransactions: DemoFuelTransaction[];
  parts: DemoPart[];
};

export type DemoDataset = { seed: number; organisations: DemoOrganisation[] };
