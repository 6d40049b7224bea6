import { sql } from "drizzle-orm";
import type { DbOrTx } from "@/db";
import {
  knownIssueCautions,
  knownIssueChecks,
  knownIssueCohorts,
  knownIssueComments,
  knownIssueParts,
  knownIssues,
  knownIssueStates,
  knownIssueWatchers,
  type CautionKind,
  type KnownIssueState,
} from "@/db/schema";
import type { DemoOrgSlug } from "./accounts";
import { DEMO_END } from "./calendar";

/** The demo's known issues were written up at the end of the demo period. */
const ENTERED_AT = `${DEMO_END}T09:00:00.000Z`;

/**
 * The demo's known issues: what each organisation's people have written up about the planted
 * patterns (patterns.ts), in Recurra's invented scenario and Recurra's own words. Some are still
 * being watched, so the demo shows the whole life of a known issue.
 */
type DemoKnownIssue = {
  orgs: DemoOrgSlug[];
  title: string;
  summary: string;
  state: KnownIssueState;
  cohort: { make: string; model: string; generation: string };
  mileage: [number | null, number | null];
  symptoms: string[];
  dtcCodes: string[];
  component: string;
  checks: string[];
  fix: string;
  laborOperation: string;
  typicalHours: number;
  cautions: CautionKind[];
  references?: string;
  /** Demo account e-mails that watch it (only those who are members of the organisation). */
  watchers: string[];
  comment?: string;
};

const KNOWN_ISSUES: DemoKnownIssue[] = [
  {
    orgs: ["northgate", "tidewater"],
    title: "Stalls just after refuelling: purge valve sticking open",
    summary:
      "A purge valve that no longer closes lets tank vapour into the intake while the tank is full of fresh vapour, so the engine idles rough and stalls within a few miles of a fill-up. Often first misread as a filler-cap or idle fault.",
    state: "watching",
    cohort: { make: "Aurel", model: "Kestrel", generation: "K2" },
    mileage: [null, null],
    symptoms: ["stall", "rough-running"],
    dtcCodes: ["P0496", "P0441"],
    component: "fuel-vapour/purge-valve",
    checks: [
      "Ask when it stalls: within a few miles of a fill-up points here.",
      "Read stored codes and freeze-frame data; note purge-flow codes.",
      "With the engine off, apply vacuum to the purge valve: it must hold when not energised.",
      "Command the valve open and closed with a scan tool and listen for the click.",
      "Inspect the purge hoses for cracks before condemning the valve.",
    ],
    fix: "Replace the purge valve and its hose clips, clear codes, and road-test through a fill-up.",
    laborOperation: "Purge valve, replace",
    typicalHours: 0.9,
    cautions: ["fuel-vapour", "electrical"],
    references: "Shop note SN-14 (internal)",
    watchers: ["admin@recurra.example", "shop-manager@recurra.example"],
    comment: "Three of these last month, two came back after a filler-cap swap. Worth watching.",
  },
  {
    orgs: ["tidewater", "northgate"],
    title: "Harsh or flaring shifts past 75,000 mi: corroded engine-to-body ground",
    summary:
      "A corroded ground strap between engine and body starves the transmission controller of a clean reference, so shifts flare or bang and the transmission lamp comes on. Shift solenoids get replaced first and the complaint returns.",
    state: "confirmed",
    cohort: { make: "Aurel", model: "Merlin", generation: "M2" },
    mileage: [75_000, null],
    symptoms: ["shift-quality", "warning-lamp"],
    dtcCodes: ["P0700", "P0730"],
    component: "power-distribution/body-ground",
    checks: [
      "Measure voltage drop between battery negative and the transmission case while cranking: more than a few tenths of a volt is suspect.",
      "Inspect the ground strap at the body end for corrosion and loose fasteners.",
      "Only then look at shift solenoids and fluid condition.",
    ],
    fix: "Replace the ground strap, clean both contact faces to bare metal, protect against corrosion, clear codes and road-test.",
    laborOperation: "Engine ground strap, replace",
    typicalHours: 0.6,
    cautions: ["electrical", "lifting"],
    watchers: ["admin@recurra.example", "manager@recurra.example"],
  },
  {
    orgs: ["tidewater", "northgate"],
    title: "Intermittent no-start: poor contact at the main fuse",
    summary:
      "The high-current main fuse loosens in its holder, heats and oxidises, so the vehicle sometimes will not crank or loses all power for a moment. Batteries get replaced first.",
    state: "watching",
    cohort: { make: "Aurel", model: "Kestrel", generation: "K3" },
    mileage: [null, null],
    symptoms: ["no-start", "electrical-accessory"],
    dtcCodes: ["P0562", "U0100"],
    component: "power-distribution/main-fuse",
    checks: [
      "Check the main fuse holder for heat marks and a loose fuse before testing the battery.",
      "Measure voltage drop across the fuse holder under load.",
      "Load-test the battery only after the connections are proven good.",
    ],
    fix: "Replace the main fuse and, when heat-marked, its holder; tighten to the specified torque.",
    laborOperation: "Main fuse and holder, replace",
    typicalHours: 0.8,
    cautions: ["electrical", "fuses"],
    watchers: ["admin@recurra.example", "manager@recurra.example"],
  },
  {
    orgs: ["northgate"],
    title: "Loss of steering assist at 50,000–75,000 mi: assist sensor connector",
    summary:
      "The steering-assist sensor connector seal hardens, moisture gets in, and the assist drops out intermittently, often with network codes.",
    state: "confirmed",
    cohort: { make: "Brindle", model: "Skua", generation: "SK3" },
    mileage: [50_000, 75_000],
    symptoms: ["steering-assist-loss"],
    dtcCodes: ["U0131", "P0550"],
    component: "steering/assist-sensor",
    checks: [
      "Read codes from the steering module; note network codes.",
      "Inspect the sensor connector for moisture and green corrosion.",
      "Wiggle-test the harness at the sensor with live data on screen.",
    ],
    fix: "Replace the assist sensor and connector seal, then run the sensor calibration.",
    laborOperation: "Steering assist sensor, replace and calibrate",
    typicalHours: 1.4,
    cautions: ["steering", "lifting", "electrical"],
    watchers: ["admin@recurra.example", "shop-manager@recurra.example"],
  },
  {
    orgs: ["northgate"],
    title: "Accessory fuse keeps blowing: hatch loom chafing",
    summary:
      "The accessory feed in the tailgate loom rubs through on the hinge and shorts to the body, so the accessory fuse blows again soon after replacement.",
    state: "mitigated",
    cohort: { make: "Ostra", model: "Wren", generation: "W2" },
    mileage: [null, null],
    symptoms: ["electrical-accessory"],
    dtcCodes: [],
    component: "power-distribution/harness",
    checks: [
      "Ask whether the fuse has been replaced before: a repeat points here.",
      "Inspect the loom where it passes the tailgate hinge for rubbed insulation.",
      "Measure the circuit's resistance to ground with the fuse out.",
    ],
    fix: "Repair the chafed wire, sleeve the loom and re-route it clear of the hinge; fit the correct fuse.",
    laborOperation: "Tailgate loom, repair and re-route",
    typicalHours: 1.1,
    cautions: ["electrical", "fuses"],
    watchers: ["admin@recurra.example"],
  },
];

/** Inserts the demo known issues of one organisation (after its records and the accounts). */
export async function insertDemoKnownIssues(
  tx: DbOrTx,
  slug: DemoOrgSlug,
  organisationId: number,
): Promise<number> {
  const userIds = new Map(
    (
      await tx.all<{ id: number; email: string }>(sql`
        select u.id, u.email from users u join memberships m on m.user_id = u.id
         where m.organisation_id = ${organisationId}`)
    ).map((u) => [u.email, Number(u.id)]),
  );
  const manager = [...userIds.entries()].find(([e]) => e.includes("manager"))?.[1] ?? null;
  let count = 0;
  for (const def of KNOWN_ISSUES.filter((k) => k.orgs.includes(slug))) {
    const [gen] = await tx.all<{ id: number }>(sql`
      select id from generations where organisation_id = ${organisationId}
         and make = ${def.cohort.make} and model = ${def.cohort.model} and label = ${def.cohort.generation}`);
    const [component] = await tx.all<{ id: number }>(
      sql`select id from components where slug = ${def.component}`,
    );
    if (!gen || !component) continue; // this organisation has no such cohort
    // The part most often fitted for this fix on this cohort, as the records write it.
    const [part] = await tx.all<{ part_numbers: string }>(sql`
      select l.part_numbers from repair_lines l join vehicles v on v.id = l.vehicle_id
       where l.organisation_id = ${organisationId} and l.component_id = ${component.id}
         and v.generation_id = ${gen.id} and l.part_numbers is not null
       group by l.part_numbers order by count(*) desc limit 1`);
    const [issue] = await tx
      .insert(knownIssues)
      .values({
        organisationId,
        title: def.title,
        summary: def.summary,
        state: def.state,
        mileageFromMi: def.mileage[0],
        mileageToMi: def.mileage[1],
        symptoms: def.symptoms.join(" "),
        dtcCodes: def.dtcCodes.join(" ") || null,
        componentId: component.id,
        fixDescription: def.fix,
        laborOperation: def.laborOperation,
        typicalHours: def.typicalHours,
        references: def.references ?? null,
        createdBy: manager,
        createdAt: ENTERED_AT,
      })
      .returning({ id: knownIssues.id });
    if (!issue) throw new Error("insertDemoKnownIssues: no row");
    const base = { organisationId, knownIssueId: issue.id };
    await tx.insert(knownIssueCohorts).values({
      ...base,
      make: def.cohort.make,
      model: def.cohort.model,
      generationId: gen.id,
    });
    await tx
      .insert(knownIssueChecks)
      .values(def.checks.map((text, i) => ({ ...base, position: i + 1, text })));
    await tx.insert(knownIssueCautions).values(def.cautions.map((kind) => ({ ...base, kind })));
    const partNumber = part?.part_numbers.split(/[\s;,]+/)[0];
    if (partNumber) {
      const [stocked] = await tx.all<{ id: number }>(sql`
        select id from parts where organisation_id = ${organisationId} and part_number = ${partNumber}`);
      await tx
        .insert(knownIssueParts)
        .values({ ...base, partNumber, quantity: 1, partId: stocked?.id ?? null });
    }
    await tx.insert(knownIssueStates).values({
      ...base,
      fromState: null,
      toState: "watching",
      reason: "Written up from the repair records.",
      userId: manager,
      createdAt: ENTERED_AT,
    });
    if (def.state !== "watching") {
      const path: KnownIssueState[] =
        def.state === "mitigated" ? ["confirmed", "mitigated"] : [def.state];
      let from: KnownIssueState = "watching";
      for (const to of path) {
        await tx.insert(knownIssueStates).values({
          ...base,
          fromState: from,
          toState: to,
          reason:
            to === "confirmed"
              ? "Technicians found it the cause again and again; the fix holds."
              : "Loom re-routing done on every affected vehicle that came in.",
          userId: manager,
          createdAt: ENTERED_AT,
        });
        from = to;
      }
    }
    const watchers = def.watchers.flatMap((e) => (userIds.has(e) ? [userIds.get(e)!] : []));
    if (watchers.length > 0) {
      await tx.insert(knownIssueWatchers).values(watchers.map((userId) => ({ ...base, userId })));
    }
    if (def.comment) {
      await tx.insert(knownIssueComments).values({
        ...base,
        userId: manager,
        body: def.comment,
        createdAt: ENTERED_AT,
      });
    }
    count++;
  }
  return count;
}
