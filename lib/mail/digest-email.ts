import escapeHtml from "escape-html";
import { AT_RISK_HORIZON } from "@/lib/at-risk";
import { describeFixHeldShare, type FixHeld } from "@/lib/fix-held";
import { countOf, describeOutlook, describeRatio, formatConfidence } from "@/lib/plain-words";

/** What the weekly digest says (jobs/digest/digest.ts buildDigest gathers it). */
export type Digest = {
  organisation: { id: number; name: string; distanceUnit: "mi" | "km" };
  since: string;
  newSignals: {
    /** "Aurel Kestrel K2 · P0496 — Purge flow …": the cohort and the fault by name. */
    label: string;
    cohort: string;
    fault: string;
    band: string;
    events: number;
    /** Against the rest of the fleet in the band; ratio null when the rest had none. */
    ratio: number | null;
    ratioLower: number | null;
    ratioUpper: number | null;
  }[];
  stateChanges: { title: string; from: string; to: string; reason: string; at: string }[];
  /**
   * Faults by name, with the vehicles that came back for them in the period and how often the
   * fault's fix held across the organisation (lib/fix-held.ts; null: no repair counted).
   */
  comebacks: { fault: string; count: number; fixHeld: FixHeld | null }[];
  /** Expected failures over the horizon, with their range at `confidence` (null: none yet). */
  atRisk: {
    vehicle: string;
    why: string;
    expected: number;
    expectedLower: number | null;
    expectedUpper: number | null;
  }[];
  confidence: number;
};

/**
 * The digest as an e-mail: a plain-text part and an HTML part with the same content (every
 * value escaped), its figures in plain words ("12 repairs, about 6 times the rest of the fleet,
 * at least 5.2 times"; "about a 38% chance of a failure, likely between 18% and 50%") and the
 * organisation's confidence said once. The exact figures are on the screens.
 */
export function buildDigestEmail(
  d: Digest,
  baseUrl: string,
): { subject: string; text: string; html: string } {
  const unit = d.organisation.distanceUnit;
  const sections: { title: string; empty: string; items: string[] }[] = [
    {
      title: "New signals",
      empty: "No new signals.",
      items: d.newSignals.map(
        (s) =>
          `${s.label}, ${s.band}: ${countOf(s.events, "repair")}, ${describeRatio({
            ratio: s.ratio,
            lower: s.ratioLower,
            upper: s.ratioUpper,
            events: s.events,
          })}`,
      ),
    },
    {
      title: "Known issues that changed state",
      empty: "No state changes.",
      items: d.stateChanges.map((c) => `${c.title}: ${c.from} → ${c.to} (${c.at}) — ${c.reason}`),
    },
    {
      title: "Top comebacks",
      empty: "No comebacks.",
      items: d.comebacks.map(
        (c) =>
          `${c.fault}: ${countOf(c.count, "vehicle")} back` +
          (c.fixHeld ? `; overall, ${describeFixHeldShare(c.fixHeld)}` : ""),
      ),
    },
    {
      title: `Vehicles most at risk over their next ${AT_RISK_HORIZON.toLocaleString("en-GB")} ${unit}`,
      empty: "No vehicle is approaching a confirmed known issue or a signal.",
      items: d.atRisk.map(
        (a) =>
          `${a.vehicle}: ${a.why} — ${describeOutlook({
            expected: a.expected,
            lower: a.expectedLower,
            upper: a.expectedUpper,
            noun: ["failure"],
          })}`,
      ),
    },
  ];
  const subject = `Recurra weekly digest: ${d.organisation.name} — ${d.newSignals.length} new signal${d.newSignals.length === 1 ? "" : "s"}`;
  const levels = `“Likely” and “at least” are at ${formatConfidence(d.confidence)} confidence; each figure's details are on its screen.`;
  const footer = "You get this because you opted in to the weekly digest (Account page).";
  const text = [
    `${d.organisation.name}: what changed since ${d.since}.`,
    "",
    ...sections.flatMap((s) => [
      s.title.toUpperCase(),
      ...(s.items.length ? s.items.map((i) => `- ${i}`) : [s.empty]),
      "",
    ]),
    levels,
    `Open Recurra: ${baseUrl}/`,
    footer,
  ].join("\n");
  const html = [
    `<p>${escapeHtml(d.organisation.name)}: what changed since ${escapeHtml(d.since)}.</p>`,
    ...sections.map(
      (s) =>
        `<h2 style="font-size:16px">${escapeHtml(s.title)}</h2>` +
        (s.items.length
          ? `<ul>${s.items.map((i) => `<li>${escapeHtml(i)}</li>`).join("")}</ul>`
          : `<p>${escapeHtml(s.empty)}</p>`),
    ),
    `<p>${escapeHtml(levels)}</p>`,
    `<p><a href="${escapeHtml(baseUrl)}/">Open Recurra</a></p>`,
    `<p style="color:#666">${escapeHtml(footer)}</p>`,
  ].join("\n");
  return { subject, text, html };
}
