import { z } from "zod";
import {
  CAUTION_KINDS,
  FINDING_OUTCOMES,
  KNOWN_ISSUE_STATES,
  type CautionKind,
  type KnownIssueState,
} from "@/db/schema/known-issues";
import { SYMPTOMS } from "@/db/schema/records";
import { parseDtc } from "@/lib/dtc";

/** The symptoms a repair line can carry (the schema's list), for screens that offer them. */
export { SYMPTOMS };

/** Words shown for each state (Recurra's own) and what it means for the people using it. */
export const STATE_LABELS: Record<KnownIssueState, { label: string; meaning: string }> = {
  watching: {
    label: "Watching",
    meaning: "Looks like a pattern; evidence is being gathered.",
  },
  confirmed: {
    label: "Confirmed",
    meaning: "The team stands behind it: technicians check for it first.",
  },
  mitigated: {
    label: "Mitigated",
    meaning: "A fix or campaign is in place; recurrence is being watched.",
  },
  retired: { label: "Retired", meaning: "No longer relevant; kept for the record." },
};

/**
 * Which state changes are allowed: forward along watching → confirmed → mitigated → retired,
 * one step back (evidence weakened, a fix did not hold), and a retired issue can be reopened.
 */
export const STATE_CHANGES: Record<KnownIssueState, readonly KnownIssueState[]> = {
  watching: ["confirmed", "retired"],
  confirmed: ["mitigated", "watching", "retired"],
  mitigated: ["retired", "confirmed"],
  retired: ["watching"],
};

export function canChangeState(from: KnownIssueState, to: KnownIssueState): boolean {
  return STATE_CHANGES[from].includes(to);
}

/**
 * The maintained caution list: the usual precautions of the trade (common practice), written in
 * Recurra's words. They never replace the manufacturer's procedure, local codes or licensed
 * practice.
 */
export const CAUTIONS: Record<CautionKind, { title: string; text: string }> = {
  electrical: {
    title: "Electrical",
    text: "Disconnect the battery negative before unplugging sensors, modules, grounds or wiring, and wait as the manufacturer states for modules to power down; probe connectors from the back with the right adapters, never by forcing pins.",
  },
  fuses: {
    title: "Fuses",
    text: "Never bridge a fuse or fit a larger one: a fuse that blows again points to a fault in its circuit; check the circuit's rating before replacing it, with the battery disconnected for high-current fuses.",
  },
  battery: {
    title: "Battery",
    text: "Batteries give off hydrogen and hold acid: no sparks or flames near them, eye protection on; disconnect the negative first and connect it last.",
  },
  "fuel-vapour": {
    title: "Fuel vapour",
    text: "Fuel vapour ignites easily: no sparks, flames or smoking; work in a ventilated area; relieve fuel-system pressure as the manufacturer describes; keep an extinguisher at hand.",
  },
  "airbag-srs": {
    title: "Airbag / SRS",
    text: "Disable the restraint system per the manufacturer's procedure and wait the stated time before removing the steering wheel, clock spring or any airbag or pretensioner part; never probe SRS connectors; keep a removed airbag face up.",
  },
  steering: {
    title: "Steering",
    text: "Loss of steering assist makes the vehicle hard to control: do not road-test until the fault is fixed; recalibrate sensors after replacement as the manufacturer requires.",
  },
  lifting: {
    title: "Lifting",
    text: "Use the vehicle's lifting points and rated equipment; never work under a vehicle held only by a jack; chock the wheels.",
  },
  "hot-parts": {
    title: "Hot oil, coolant and exhaust",
    text: "Let the engine cool: hot oil, transmission fluid and exhaust parts burn, and a hot cooling system is under pressure: never open it hot. Collect used fluids for proper disposal.",
  },
  "brake-dust": {
    title: "Brake dust",
    text: "Do not blow brake dust off with compressed air: clean with a wet method or a brake cleaner and wear a mask; brake fluid harms skin, eyes and paint.",
  },
  springs: {
    title: "Springs under load",
    text: "Coil springs store energy: compress them only with a rated spring compressor and keep hands out of its path, as the manufacturer describes.",
  },
  refrigerant: {
    title: "Refrigerant",
    text: "Air-con refrigerant must be recovered with the proper equipment by certified people, as local rules require; it freezes skin and eyes on contact.",
  },
  "high-voltage": {
    title: "High voltage",
    text: "This vehicle has a high-voltage system: orange cables and marked parts can kill. Only trained and authorised people isolate it, with insulated tools and PPE, following the manufacturer's procedure, before any work near it.",
  },
  other: { title: "Other", text: "" },
};

/** Cautions of a component's system, where its own are not listed (common practice). */
const SYSTEM_CAUTIONS: Record<string, CautionKind[]> = {
  "fuel-vapour": ["fuel-vapour"],
  "fuel-delivery": ["fuel-vapour", "electrical"],
  "power-distribution": ["electrical"],
  "starting-charging": ["electrical"],
  "body-electrical": ["electrical"],
  ignition: ["electrical"],
  "engine-management": ["electrical"],
  "engine-mechanical": ["hot-parts", "lifting"],
  cooling: ["hot-parts"],
  network: ["electrical"],
  restraints: ["airbag-srs", "electrical"],
  steering: ["steering", "lifting"],
  suspension: ["lifting"],
  brakes: ["brake-dust", "lifting"],
  transmission: ["hot-parts", "lifting"],
  exhaust: ["hot-parts", "lifting"],
  hvac: ["electrical"],
  "tyres-wheels": ["lifting"],
};

/** A component's own cautions where they differ from its system's (common practice). */
const COMPONENT_CAUTIONS: Record<string, CautionKind[]> = {
  "power-distribution/main-fuse": ["electrical", "fuses"],
  "power-distribution/accessory-fuses": ["electrical", "fuses"],
  "power-distribution/relays": ["electrical", "fuses"],
  "starting-charging/battery": ["battery", "electrical"],
  "starting-charging/battery-cables": ["battery", "electrical"],
  "starting-charging/starter": ["battery", "electrical", "lifting"],
  "starting-charging/alternator": ["battery", "electrical"],
  "engine-mechanical/oil-service": ["hot-parts", "lifting"],
  "engine-mechanical/air-filter": [],
  "engine-mechanical/valve-cover-gasket": ["hot-parts"],
  "engine-mechanical/drive-belt": ["hot-parts", "battery"],
  "hvac/compressor": ["refrigerant", "electrical"],
  "hvac/cabin-filter": [],
  "suspension/struts": ["springs", "lifting"],
  "steering/assist-sensor": ["steering", "electrical"],
  "steering/assist-module": ["steering", "electrical"],
  "brakes/brake-fluid": ["brake-dust", "lifting"],
  "brakes/wheel-speed-sensors": ["electrical", "lifting"],
  "transmission/shift-solenoids": ["hot-parts", "electrical", "lifting"],
  "transmission/speed-sensors": ["electrical", "lifting"],
  "restraints/clock-spring": ["airbag-srs", "electrical"],
  "inspection/scheduled-inspection": ["lifting"],
};

/** The caution kinds that go with a component slug such as "fuel-vapour/purge-valve". */
export function cautionsForComponent(slug: string | null | undefined): CautionKind[] {
  if (!slug) return [];
  return COMPONENT_CAUTIONS[slug] ?? SYSTEM_CAUTIONS[slug.split("/")[0] ?? ""] ?? [];
}

const HIGH_VOLTAGE_WORDS = /\b(hybrid|phev|hev|bev|ev|electric|e-motor|plug-in)\b/i;

/**
 * Whether a vehicle carries a high-voltage system: its generation in the catalogue says hybrid
 * or electric, or its engine description does ("2.0 hybrid", "EV", "electric").
 */
export function isHighVoltageVehicle(v: {
  powertrain?: string | null;
  engine?: string | null;
}): boolean {
  if (v.powertrain === "hybrid" || v.powertrain === "electric") return true;
  return v.engine ? HIGH_VOLTAGE_WORDS.test(v.engine) : false;
}

/**
 * The cautions to show for work on a vehicle: the given kinds (a known issue's or a
 * component's), with high voltage first when the vehicle has a high-voltage system.
 */
export function cautionsForWork(
  kinds: readonly CautionKind[],
  vehicle: { isHighVoltage: boolean },
): { kind: CautionKind; title: string; text: string }[] {
  const all: CautionKind[] = vehicle.isHighVoltage
    ? ["high-voltage", ...kinds.filter((k) => k !== "high-voltage")]
    : [...kinds];
  return [...new Set(all)]
    .filter((k) => k !== "other")
    .map((kind) => ({ kind, ...CAUTIONS[kind] }));
}

export const SYMPTOM_LABELS: Record<(typeof SYMPTOMS)[number], string> = {
  stall: "Stall",
  "no-start": "No-start",
  "rough-running": "Rough running",
  "lack-of-power": "Lack of power",
  "warning-lamp": "Warning lamp",
  "shift-quality": "Shift quality",
  "steering-assist-loss": "Steering assist loss",
  "electrical-accessory": "Electrical accessory",
  noise: "Noise",
  leak: "Leak",
  overheating: "Overheating",
  other: "Other",
};

/** "P0496 p0441, P0455" → ["P0496", "P0441", "P0455"], or the codes that are not DTCs. */
export function parseDtcList(raw: string | undefined): { codes: string[]; invalid: string[] } {
  const codes: string[] = [];
  const invalid: string[] = [];
  for (const token of (raw ?? "").split(/[\s,;]+/).filter(Boolean)) {
    const info = parseDtc(token);
    if (info) {
      if (!codes.includes(info.code)) codes.push(info.code);
    } else invalid.push(token);
  }
  return { codes, invalid };
}

const text = (max: number) => z.string().trim().max(max, `At most ${max} characters.`);
const optionalNumber = (max: number) =>
  z.coerce
    .number()
    .min(0, "Not below 0.")
    .max(max, `At most ${max.toLocaleString("en-GB")}.`);

/** "A-1234 x2" or "A-1234" per line → part number and quantity. */
function parseParts(raw: string | undefined) {
  return (raw ?? "")
    .split(/\r?\n/)
    .map((l) => l.trim())
    .filter(Boolean)
    .map((l) => {
      const m = /^(\S+)(?:\s*[x×]\s*(\d+))?$/i.exec(l);
      return m ? { partNumber: m[1] ?? l, quantity: Number(m[2] ?? 1) } : null;
    });
}

/**
 * A known issue as the form sends it. Multi-choice fields come as one checkbox per option
 * (`cohort:<make>|<model>|<generationId or *>`, `symptom:<slug>`, `caution:<kind>`), lists
 * one per line.
 */
export const KnownIssueForm = z
  .object({
    title: z
      .string({ error: "Give the known issue a title." })
      .trim()
      .min(3, "Give the known issue a title (at least 3 characters).")
      .max(160, "At most 160 characters."),
    summary: text(4000).optional(),
    mileageFrom: optionalNumber(2_000_000).optional(),
    mileageTo: optionalNumber(2_000_000).optional(),
    dtcCodes: text(400).optional(),
    componentSlug: text(80).optional(),
    checks: text(6000).optional(),
    fixDescription: text(4000).optional(),
    laborOperation: text(160).optional(),
    typicalHours: optionalNumber(200).optional(),
    parts: text(2000).optional(),
    cautionText: text(1000).optional(),
    references: text(1000).optional(),
    signalId: z.coerce.number().int().positive().optional(),
  })
  .catchall(z.unknown())
  .transform((form, ctx) => {
    const cohorts: { make: string; model: string; generationId: number | null }[] = [];
    const symptoms: string[] = [];
    const cautions: CautionKind[] = [];
    for (const [key, value] of Object.entries(form)) {
      if (value === undefined || value === "" || value === "off") continue;
      if (key.startsWith("cohort:")) {
        const [make, model, gen] = key.slice(7).split("|");
        if (make && model)
          cohorts.push({ make, model, generationId: gen && gen !== "*" ? Number(gen) : null });
      } else if (key.startsWith("symptom:")) {
        const s = key.slice(8);
        if ((SYMPTOMS as readonly string[]).includes(s)) symptoms.push(s);
      } else if (key.startsWith("caution:")) {
        const c = key.slice(8) as CautionKind;
        if (CAUTION_KINDS.includes(c)) cautions.push(c);
      }
    }
    if (cohorts.length === 0) {
      ctx.addIssue({ code: "custom", path: ["cohorts"], message: "Choose at least one cohort." });
    }
    if (cohorts.some((c) => c.generationId !== null && !Number.isInteger(c.generationId))) {
      ctx.addIssue({ code: "custom", path: ["cohorts"], message: "Unknown generation." });
    }
    if (
      form.mileageFrom !== undefined &&
      form.mileageTo !== undefined &&
      form.mileageTo <= form.mileageFrom
    ) {
      ctx.addIssue({
        code: "custom",
        path: ["mileageTo"],
        message: "The end of the range must be above its start.",
      });
    }
    const dtcs = parseDtcList(form.dtcCodes);
    if (dtcs.invalid.length > 0) {
      ctx.addIssue({
        code: "custom",
        path: ["dtcCodes"],
        message: `Not a diagnostic trouble code (SAE J2012 form, e.g. P0496): ${dtcs.invalid.join(", ")}.`,
      });
    }
    if (dtcs.codes.length === 0 && !form.componentSlug) {
      ctx.addIssue({
        code: "custom",
        path: ["dtcCodes"],
        message: "Name the fault: at least one DTC or a component.",
      });
    }
    const parts = parseParts(form.parts);
    if (parts.some((p) => p === null)) {
      ctx.addIssue({
        code: "custom",
        path: ["parts"],
        message:
          "Write one part per line: the part number, optionally followed by × and a quantity.",
      });
    }
    if (form.cautionText && !cautions.includes("other")) cautions.push("other");
    return {
      title: form.title,
      summary: form.summary ?? null,
      mileageFrom: form.mileageFrom ?? null,
      mileageTo: form.mileageTo ?? null,
      dtcCodes: dtcs.codes,
      componentSlug: form.componentSlug ?? null,
      symptoms,
      cohorts,
      checks: (form.checks ?? "")
        .split(/\r?\n/)
        .map((l) => l.replace(/^\s*(\d+[.)]|[-*•])\s*/, "").trim())
        .filter(Boolean),
      fixDescription: form.fixDescription ?? null,
      laborOperation: form.laborOperation ?? null,
      typicalHours: form.typicalHours ?? null,
      parts: parts.filter((p) => p !== null),
      cautions,
      cautionText: form.cautionText ?? null,
      references: form.references ?? null,
      signalId: form.signalId ?? null,
    };
  });
export type KnownIssueInput = z.output<typeof KnownIssueForm>;

export const StateChangeForm = z.object({
  knownIssueId: z.coerce.number().int().positive(),
  toState: z.enum(KNOWN_ISSUE_STATES),
  reason: z
    .string({ error: "Say why (at least 3 characters)." })
    .trim()
    .min(3, "Say why (at least 3 characters).")
    .max(2000, "At most 2000 characters."),
});

export const CommentForm = z.object({
  knownIssueId: z.coerce.number().int().positive(),
  body: z
    .string({ error: "Write a comment." })
    .trim()
    .min(1, "Write a comment.")
    .max(4000, "At most 4000 characters."),
});

export const FindingForm = z
  .object({
    vehicleId: z.coerce.number().int().positive(),
    knownIssueId: z.coerce.number().int().positive().optional(),
    outcome: z.enum(FINDING_OUTCOMES),
    odometer: optionalNumber(2_000_000).optional(),
    dtcCodes: text(400).optional(),
    symptom: z.enum(SYMPTOMS).optional(),
    complaint: text(1000).optional(),
    cause: text(2000).optional(),
    correction: text(2000).optional(),
    /**
     * A cause that is a component but no known issue (a computed pattern of the lookup): the
     * finding's repair line is recorded as fixed at that component.
     */
    componentSlug: text(80).optional(),
  })
  .superRefine((f, ctx) => {
    if (f.componentSlug && (f.outcome !== "something-else" || f.knownIssueId !== undefined)) {
      ctx.addIssue({
        code: "custom",
        path: ["componentSlug"],
        message: "A component is named only for a cause that is not a known issue.",
      });
    }
    if (f.outcome !== "something-else" && f.knownIssueId === undefined) {
      ctx.addIssue({
        code: "custom",
        path: ["knownIssueId"],
        message: "Choose the known issue this finding is about.",
      });
    }
    const dtcs = parseDtcList(f.dtcCodes);
    if (dtcs.invalid.length > 0) {
      ctx.addIssue({
        code: "custom",
        path: ["dtcCodes"],
        message: `Not a diagnostic trouble code (SAE J2012 form, e.g. P0496): ${dtcs.invalid.join(", ")}.`,
      });
    }
    if (f.outcome === "something-else" && !f.cause) {
      ctx.addIssue({
        code: "custom",
        path: ["cause"],
        message: "Say what the cause was.",
      });
    }
  });
export type FindingInput = z.output<typeof FindingForm>;

/** Image types accepted as attachments (photos of failed parts), and the size limit. */
export const ATTACHMENT_TYPES = ["image/jpeg", "image/png", "image/webp", "image/gif"] as const;
export const ATTACHMENT_MAX_BYTES = 10 * 1024 * 1024;
