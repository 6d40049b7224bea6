import { defineFault, defineRepair } from "./faults";
import type { FaultDef } from "./types";

/**
 * The patterns planted in the demo for people to find. Each is confined to one cohort, runs at
 * several times the background rate of its cell, and hides among ordinary repairs. The first
 * repair often misses the real cause, so each pattern also produces comebacks.
 */

/**
 * Aurel Kestrel K2: a purge valve that sticks open floods the intake with vapour after a
 * fill-up, so the engine idles rough and stalls within a few miles of the pump.
 */
export const KESTREL_K2_PURGE_STALL = defineFault({
  key: "kestrel-k2-purge-stall",
  cohort: { model: "Kestrel", generation: "K2" },
  symptom: "stall",
  isUrgent: true,
  trigger: "refuel",
  ratePer10k: 0.14,
  rateAt: () => 0.14,
  minGapMi: 40000,
  codes: [["P0496"], ["P0441"], ["P0496", "P0441"], ["P0455", "P0496"], ["P0441", "P0506"]],
  codeShare: 0.9,
  complaints: [
    "Stalled pulling out of the fuel station",
    "Rough idle then stall just after filling up",
    "Hard to restart after fill-up, stalled at the junction",
    "Cuts out at idle within a mile of refuelling",
    "Stall at lights right after fuel stop, restarted on third try",
  ],
  fix: defineRepair(
    "fuel-vapour/purge-valve",
    [
      "Purge valve stuck open; vapour flooding intake at idle",
      "Purge valve holds no vacuum on bench test",
      "Purge valve leaking through when closed",
    ],
    [
      "Replaced purge valve, cleared codes, road tested through a fill-up",
      "Fitted new purge valve and hose clips, vapour test passed",
    ],
    [0.7, 1.2],
  ),
  wrongFixChance: 0.45,
  wrongFixes: [
    defineRepair(
      null,
      ["Could not reproduce on road test", "No fault found; codes stored only"],
      ["Cleared codes, road tested 10 miles OK", "Cleared codes, advised driver to report again"],
      [0.5, 1],
    ),
    defineRepair(
      "fuel-vapour/filler-cap",
      ["Filler cap seal worn, suspected vapour leak"],
      ["Replaced filler cap, cleared codes"],
      [0.3, 0.5],
    ),
    defineRepair(
      "engine-management/throttle-body",
      ["Throttle body dirty, idle unstable"],
      ["Cleaned throttle body, idle relearn"],
      [0.8, 1.2],
      [],
    ),
  ],
  recurrenceDays: [2, 20],
  shopCapture: 0.4,
});

/**
 * Aurel Merlin M2: the transmission's ground strap corrodes at the body stud; past about
 * 75,000 mi the voltage drop upsets the transmission computer and shifts turn harsh.
 */
export const MERLIN_M2_SHIFT_GROUND = defineFault({
  key: "merlin-m2-shift-ground",
  cohort: { model: "Merlin", generation: "M2" },
  symptom: "shift-quality",
  ratePer10k: 0.45,
  rateAt: (odo) => (odo >= 75000 ? 0.45 : odo >= 65000 ? 0.04 : 0),
  minGapMi: 15000,
  isPowertrain: true,
  codes: [
    ["P0700", "P0730"],
    ["P0700", "P0750"],
    ["P0730"],
    ["P0700", "P0730", "P0562"],
    ["P0750"],
  ],
  codeShare: 0.9,
  complaints: [
    "Harsh 2-3 shift when warm",
    "Flares between gears, then limp mode",
    "Transmission lamp on, bangs into gear",
    "Delayed engagement into drive, shift flare",
  ],
  fix: defineRepair(
    "power-distribution/body-ground",
    [
      "Transmission ground strap corroded at body stud; 0.9 V drop under load",
      "Ground strap green with corrosion, high resistance to body",
    ],
    [
      "Cleaned body stud, replaced ground strap, cleared codes, adaptive relearn",
      "Fitted new ground strap, sealed joint, relearn and road test OK",
    ],
    [0.8, 1.5],
  ),
  wrongFixChance: 0.35,
  wrongFixes: [
    defineRepair(
      "transmission/fluid-service",
      ["Fluid dark and burnt smelling", "Fluid level low, suspected cause of flare"],
      ["Fluid and filter service, cleared codes, relearn"],
      [1, 1.5],
    ),
    defineRepair(
      "transmission/shift-solenoids",
      ["Shift solenoid A suspected from codes"],
      ["Replaced shift solenoid pack, relearn"],
      [2.5, 3.5],
    ),
  ],
  recurrenceDays: [4, 25],
  shopCapture: 0.4,
});

/**
 * Aurel Kestrel K3: the high-current main fuse sits loose in its holder; the contact heats,
 * oxidises and drops out, so the vehicle is intermittently dead on the key.
 */
export const KESTREL_K3_MAIN_FUSE_NO_START = defineFault({
  key: "kestrel-k3-main-fuse-no-start",
  cohort: { model: "Kestrel", generation: "K3" },
  symptom: "no-start",
  isUrgent: true,
  ratePer10k: 0.3,
  rateAt: () => 0.3,
  minGapMi: 20000,
  codes: [["P0562"], ["U0100"], ["P0562", "U0100"]],
  codeShare: 0.5,
  complaints: [
    "Intermittent no-start: no dash lights, fine after a few minutes",
    "Dead on key turn, everything off; started later on its own",
    "No crank, no lights; came back after door opened and closed",
  ],
  fix: defineRepair(
    "power-distribution/main-fuse",
    [
      "High-current fuse loose in holder; contact face burnt",
      "Poor contact at main fuse terminal, heat marks on holder",
    ],
    [
      "Replaced main fuse and holder terminal, torqued, voltage-drop tested",
      "Fitted new high-current fuse and holder, checked all battery feeds",
    ],
    [0.8, 1.4],
  ),
  wrongFixChance: 0.45,
  wrongFixes: [
    defineRepair(
      "starting-charging/battery",
      ["Battery tested marginal", "Battery slow to recover on tester"],
      ["Replaced battery"],
      [0.3, 0.5],
    ),
    defineRepair(
      "starting-charging/battery-cables",
      ["Battery clamp slightly loose"],
      ["Cleaned and tightened battery clamps"],
      [0.3, 0.6],
      [],
    ),
    defineRepair(
      null,
      ["Could not reproduce; started every time"],
      ["No fault found, returned to service"],
      [0.5, 1],
    ),
  ],
  recurrenceDays: [3, 28],
  shopCapture: 0.45,
});

/**
 * Brindle Skua SK3: the steering assist sensor connector lets in water; the fault shows up in
 * one mileage band (50,000–75,000 mi), as the connector seal hardens.
 */
export const SKUA_SK3_ASSIST_LOSS = defineFault({
  key: "skua-sk3-assist-loss",
  cohort: { model: "Skua", generation: "SK3" },
  symptom: "steering-assist-loss",
  isUrgent: true,
  ratePer10k: 0.3,
  rateAt: (odo) => (odo >= 50000 && odo < 75000 ? 0.3 : odo >= 45000 && odo < 80000 ? 0.05 : 0),
  minGapMi: 30000,
  codes: [["U0131", "P0550"], ["P0550"], ["U0131"]],
  codeShare: 0.95,
  complaints: [
    "Steering went heavy at low speed, warning on dash",
    "Lost power steering on a turn, came back after restart",
    "Heavy steering intermittently, lamp on",
  ],
  fix: defineRepair(
    "steering/assist-sensor",
    [
      "Assist sensor connector corroded, signal dropping out",
      "Assist sensor reading erratic on scan data",
    ],
    [
      "Replaced steering assist sensor and connector pigtail, calibrated, road tested",
      "Fitted new assist sensor, sealed connector, calibrated",
    ],
    [1.2, 2],
  ),
  wrongFixChance: 0.25,
  wrongFixes: [
    defineRepair(
      null,
      ["Could not reproduce; codes history only"],
      ["Cleared codes, road tested OK"],
      [0.5, 1],
    ),
  ],
  recurrenceDays: [5, 28],
  shopCapture: 0.6,
});

/**
 * Ostra Wren W2: the accessory feed chafes on the rear hatch hinge and blows its fuse again and
 * again until someone finds the rubbed wire.
 */
export const WREN_W2_ACCESSORY_FUSE = defineFault({
  key: "wren-w2-accessory-fuse",
  cohort: { model: "Wren", generation: "W2" },
  symptom: "electrical-accessory",
  ratePer10k: 0.35,
  rateAt: () => 0.35,
  minGapMi: 20000,
  complaints: [
    "Power outlets and radio dead again",
    "Accessory fuse blown again",
    "Charger socket and radio stopped working",
  ],
  fix: defineRepair(
    "power-distribution/harness",
    [
      "Accessory feed chafed on rear hatch hinge, shorting to body",
      "Rubbed-through wire in hatch loom, short to ground",
    ],
    [
      "Repaired chafed wire, re-routed and sleeved loom, replaced 15 A accessory fuse",
      "Repaired loom at hatch hinge, added protection, new fuse",
    ],
    [1.5, 2.5],
    [
      { slug: "power-distribution/harness", qty: 1 },
      { slug: "power-distribution/accessory-fuses", qty: 1 },
    ],
  ),
  wrongFixChance: 0.6,
  wrongFixes: [
    defineRepair(
      "power-distribution/accessory-fuses",
      ["Accessory fuse blown", "15 A accessory fuse open"],
      ["Replaced 15 A accessory fuse, all accessories working", "Replaced fuse, tested outlets"],
      [0.2, 0.5],
    ),
  ],
  recurrenceDays: [7, 50],
  shopCapture: 0.5,
});

export const PLANTED_PATTERNS: readonly FaultDef[] = [
  KESTREL_K2_PURGE_STALL,
  MERLIN_M2_SHIFT_GROUND,
  KESTREL_K3_MAIN_FUSE_NO_START,
  SKUA_SK3_ASSIST_LOSS,
  WREN_W2_ACCESSORY_FUSE,
];
