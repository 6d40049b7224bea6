import { findComebacks, type ComebackWindow, type RepairVisit } from "@/lib/comebacks";
import { fixHeld, isWindowOpen, type FixFault, type FixLine } from "@/lib/fix-held";
import { faultName } from "@/lib/plain-words";
import { wilsonInterval } from "@/lib/stats";

/**
 * Comeback rates per fault, fix, vendor, technician and technician × job type, from repair
 * lines. Pure: the data layer reads the lines, this module groups and counts.
 *
 * - A **repair** is a repair line that names a fault: at least one DTC or a component. Lines
 *   with neither cannot come back "for the same fault" and are only counted (noFault).
 * - The **same fault** is the same DTC or the same component (lib/comebacks.ts pairs the visits
 *   of one fault: lines of one vehicle on one day are one visit; the next visit for that fault
 *   is a comeback when it is at most `days` days later or at most `miles` further on).
 * - A repair **came back** when, for any of its faults, its visit is the first of such a pair.
 *   Every line of that vehicle and day with that fault shares the outcome.
 * - **Window still open**: a repair less than `days` days before `asOf` (the latest repair on
 *   record) may still come back; it is left out of every rate and counted (stillOpen).
 * - **Fix** = the component (or "codes only") + the action of the correction: the earliest of a
 *   short list of verbs in the correction text (replace, clean, adjust, repair, reprogram,
 *   clear codes / no fault found, service), else "other". Recurra records no labour operation
 *   code on a repair line, so the correction text is the only description of what was done.
 * - **Job type** = the component's system (or "Codes only").
 * Rates carry the Wilson score interval (Wilson 1927; statistics.md §1) at `confidence` (the
 * organisation's level; 95% by default). Faults are named as people name them: a DTC with its
 * description when `dtcDescriptions` has it, a component as "System → Name".
 */

export type ComebackOptions = {
  /** Level of every rate's interval (default 0.95). */
  confidence?: number;
  /** DTC → its description, for the fault names. */
  dtcDescriptions?: ReadonlyMap<string, string>;
};

export type ComebackLine = {
  id: number;
  repairOrderId: number;
  roNumber: string;
  vehicleId: number;
  /** ISO date, YYYY-MM-DD. */
  openedOn: string;
  odometerMi: number | null;
  dtcs: readonly string[];
  component: { slug: string; system: string; name: string } | null;
  complaint: string | null;
  cause: string | null;
  correction: string | null;
  technician: string | null;
  vendor: string | null;
};

export type ComebackRate = {
  key: string;
  label: string;
  repairs: number;
  comebacks: number;
  /** Comebacks ÷ repairs with its Wilson interval; null with no repairs. */
  rate: number | null;
  lower: number | null;
  upper: number | null;
};

export type ComebackPair = {
  /** Faults the two visits share, by name ("P0496 — Purge flow …", "Fuel vapour → Purge valve"). */
  faults: string[];
  first: ComebackLine;
  again: ComebackLine;
  days: number;
  miles: number | null;
};

export type ComebackAnalysis = {
  window: ComebackWindow;
  asOf: string | null;
  repairs: number;
  comebacks: number;
  overall: ComebackRate;
  noFault: number;
  stillOpen: number;
  byFault: ComebackRate[];
  byFix: ComebackRate[];
  byVendor: ComebackRate[];
  byTechnician: ComebackRate[];
  /** Technician × job type, for coaching. */
  byTechnicianJob: (ComebackRate & { technician: string; jobType: string })[];
  pairs: ComebackPair[];
};

const ACTIONS: [string, RegExp][] = [
  ["replace", /\b(replac\w*|fitted|fit|renew\w*|install\w*|swapp?\w*)\b/],
  ["clean", /\b(clean\w*|flush\w*|decarboni[sz]\w*)\b/],
  ["adjust", /\b(adjust\w*|relearn\w*|calibrat\w*|align\w*|reset)\b/],
  ["repair", /\b(repair\w*|resolder\w*|splic\w*|tighten\w*|secur\w*|re-?terminat\w*)\b/],
  ["reprogram", /\b(reflash\w*|reprogram\w*|updat\w*)\b/],
  ["clear codes / no fault found", /\b(clear\w*|no fault|could not reproduce|advised)\b/],
  ["service", /\b(service\w*|exchange|oil|top(ped)? up|inspect\w*|bled|drain\w*)\b/],
];

/** The action of a correction text, in a few words (see the module comment). */
export function correctionAction(correction: string | null): string {
  const text = (correction ?? "").toLowerCase();
  let best: { action: string; at: number } | null = null;
  for (const [action, re] of ACTIONS) {
    const m = re.exec(text);
    if (m && (best === null || m.index < best.at)) best = { action, at: m.index };
  }
  return best?.action ?? (text.trim() ? "other" : "not recorded");
}

/** The fault of a key, as lib/fix-held.ts reads it. */
export function faultOfKey(key: string): FixFault {
  return key.startsWith("dtc:")
    ? { component: null, dtcs: [key.slice(4)] }
    : { component: key.slice("component:".length), dtcs: [] };
}

const componentLabel = (c: NonNullable<ComebackLine["component"]>) => `${c.system} → ${c.name}`;

/** The faults of a line: "dtc:P0496", "component:fuel-vapour/purge-valve". */
export function faultKeysOf(line: ComebackLine): string[] {
  const keys = [...new Set(line.dtcs.map((d) => `dtc:${d.toUpperCase()}`))];
  if (line.component) keys.push(`component:${line.component.slug}`);
  return keys;
}

export function fixOf(line: ComebackLine): { key: string; label: string } {
  const action = correctionAction(line.correction);
  const what = line.component ? componentLabel(line.component) : "Codes only (no component)";
  return { key: `${line.component?.slug ?? "-"}|${action}`, label: `${what}: ${action}` };
}

export function jobTypeOf(line: ComebackLine): string {
  return line.component?.system ?? "Codes only (no component)";
}

const SEP = "\u0000";

function rateOf(
  key: string,
  label: string,
  repairs: number,
  comebacks: number,
  confidence: number,
): ComebackRate {
  if (repairs === 0)
    return { key, label, repairs, comebacks, rate: null, lower: null, upper: null };
  const w = wilsonInterval(comebacks, repairs, confidence);
  return { key, label, repairs, comebacks, rate: w.estimate, lower: w.lower, upper: w.upper };
}

export function analyseComebacks(
  lines: readonly ComebackLine[],
  window: ComebackWindow,
  asOf: string | null = null,
  opts: ComebackOptions = {},
): ComebackAnalysis {
  const confidence = opts.confidence ?? 0.95;
  const withFault = lines.filter((l) => faultKeysOf(l).length > 0);
  const noFault = lines.length - withFault.length;
  const faultLabel = new Map<string, string>();

  // Visits of each fault, then the pairs that make a comeback.
  const linesOfFault = new Map<string, ComebackLine[]>();
  for (const l of withFault) {
    for (const k of faultKeysOf(l)) {
      const list = linesOfFault.get(k) ?? [];
      list.push(l);
      linesOfFault.set(k, list);
      if (!faultLabel.has(k))
        faultLabel.set(
          k,
          k.startsWith("dtc:")
            ? faultName({ dtc: k.slice(4), dtcDescription: opts.dtcDescriptions?.get(k.slice(4)) })
            : componentLabel(l.component!),
        );
    }
  }
  const byId = new Map(withFault.map((l) => [l.id, l]));
  /** "vehicle|day|fault" of each visit that came back. */
  const cameBack = new Set<string>();
  const pairMap = new Map<string, ComebackPair>();
  for (const [fault, list] of linesOfFault) {
    const visits: RepairVisit[] = list.map((l) => ({
      id: l.id,
      vehicleId: l.vehicleId,
      openedOn: l.openedOn,
      odometerMi: l.odometerMi,
    }));
    for (const c of findComebacks(visits, window)) {
      cameBack.add(`${c.first.vehicleId}|${c.first.openedOn}|${fault}`);
      const key = `${c.first.vehicleId}|${c.first.openedOn}|${c.again.openedOn}`;
      const existing = pairMap.get(key);
      const label = faultLabel.get(fault)!;
      if (existing) existing.faults.push(label);
      else
        pairMap.set(key, {
          faults: [label],
          first: byId.get(c.first.id)!,
          again: byId.get(c.again.id)!,
          days: c.days,
          miles: c.miles,
        });
    }
  }

  const isOpen = (l: ComebackLine) => isWindowOpen(l.openedOn, asOf, window.days);
  const counted = withFault.filter((l) => !isOpen(l));
  const stillOpen = withFault.length - counted.length;
  const outcome = (l: ComebackLine) =>
    faultKeysOf(l).some((k) => cameBack.has(`${l.vehicleId}|${l.openedOn}|${k}`));

  const tally = (keyOf: (l: ComebackLine) => { key: string; label: string }) => {
    const out = new Map<string, { label: string; repairs: number; comebacks: number }>();
    for (const l of counted) {
      const { key, label } = keyOf(l);
      const t = out.get(key) ?? { label, repairs: 0, comebacks: 0 };
      t.repairs++;
      if (outcome(l)) t.comebacks++;
      out.set(key, t);
    }
    return [...out].map(([key, t]) => rateOf(key, t.label, t.repairs, t.comebacks, confidence));
  };
  // Per fault: how often its fix held (lib/fix-held.ts, the one definition the known issue,
  // the lookup and the digest show); the share that came back is its comebacks ÷ repairs.
  const fixLines: FixLine[] = withFault.map((l) => ({
    id: l.id,
    vehicleId: l.vehicleId,
    openedOn: l.openedOn,
    odometerMi: l.odometerMi,
    kind: "failure",
    componentSlug: l.component?.slug ?? null,
    codes: l.dtcs.map((d) => d.toUpperCase()),
  }));
  const byFault = [...linesOfFault.keys()].flatMap((fault) => {
    const held = fixHeld(fixLines, faultOfKey(fault), { window, confidence, asOf });
    return held
      ? [rateOf(fault, faultLabel.get(fault)!, held.fixes, held.comebacks, confidence)]
      : [];
  });
  const orNot = (s: string | null, none: string) => (s && s.trim() ? s.trim() : none);
  const comebacks = counted.filter(outcome).length;
  const byRate = (a: ComebackRate, b: ComebackRate) =>
    (b.lower ?? 0) - (a.lower ?? 0) || b.comebacks - a.comebacks || a.label.localeCompare(b.label);

  return {
    window,
    asOf,
    repairs: counted.length,
    comebacks,
    overall: rateOf("all", "All repairs", counted.length, comebacks, confidence),
    noFault,
    stillOpen,
    byFault: byFault.filter((r) => r.repairs > 0).sort(byRate),
    byFix: tally(fixOf).sort(byRate),
    byVendor: tally((l) => {
      const v = orNot(l.vendor, "Vendor not recorded");
      return { key: v, label: v };
    }).sort(byRate),
    byTechnician: tally((l) => {
      const t = orNot(l.technician, "Technician not recorded");
      return { key: t, label: t };
    }).sort(byRate),
    byTechnicianJob: tally((l) => {
      const t = orNot(l.technician, "Technician not recorded");
      return { key: `${t}${SEP}${jobTypeOf(l)}`, label: `${t}: ${jobTypeOf(l)}` };
    })
      .map((r) => {
        const [technician = "", jobType = ""] = r.key.split(SEP);
        return { ...r, technician, jobType };
      })
      .sort((a, b) => a.technician.localeCompare(b.technician) || byRate(a, b)),
    pairs: [...pairMap.values()].sort(
      (a, b) => b.again.openedOn.localeCompare(a.again.openedOn) || b.first.id - a.first.id,
    ),
  };
}
