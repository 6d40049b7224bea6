import { describe, expect, test } from "vitest";
import { buildDigestEmail, type Digest } from "@/lib/mail/digest-email";

const digest: Digest = {
  organisation: { id: 1, name: "Tidewater <Parcel> Co-op", distanceUnit: "km" },
  since: "2026-11-30",
  newSignals: [
    {
      label: "Aurel Kestrel K2 · P0496 — Purge flow seen while the purge valve should be shut",
      cohort: "Aurel Kestrel K2",
      fault: "P0496 — Purge flow seen while the purge valve should be shut",
      band: "241,402–281,635 km",
      events: 14,
      ratio: 6.02,
      ratioLower: 5.2,
      ratioUpper: 7.1,
    },
    {
      label: "Aurel Merlin M2 · Power distribution → Body ground strap",
      cohort: "Aurel Merlin M2",
      fault: "Power distribution → Body ground strap",
      band: "120,701–160,934 km",
      events: 28,
      ratio: null,
      ratioLower: 27.84,
      ratioUpper: null,
    },
  ],
  stateChanges: [],
  comebacks: [
    { fault: "P0300 — Random misfire", count: 1, fixHeld: null },
    {
      fault: "Fuel vapour → Purge valve",
      count: 3,
      // Wilson 1927 via statistics.md: 81/263 → 0.2553–0.3662 at 95% (Newcombe 1998, method 3).
      fixHeld: {
        fixes: 263,
        stillOpen: 4,
        held: 81,
        comebacks: 182,
        estimate: 81 / 263,
        lower: 0.2553,
        upper: 0.3662,
        confidence: 0.95,
        window: { days: 30, miles: 3000 },
      },
    },
  ],
  atRisk: [
    {
      vehicle: "T-104",
      why: "Harsh or flaring shifts",
      expected: 0.48,
      expectedLower: 0.2,
      expectedUpper: 0.7,
    },
    {
      vehicle: "T-022",
      why: "Signal: Fuel vapour → Purge valve",
      expected: 3.2,
      expectedLower: 1.1,
      expectedUpper: 6.4,
    },
  ],
  confidence: 0.9,
};

describe("the weekly digest e-mail in plain words", () => {
  const mail = buildDigestEmail(digest, "https://recurra.example");

  test("signals: the fault by name, the count, the ratio in words; never ∞", () => {
    expect(mail.text).toContain(
      "- Aurel Kestrel K2 · P0496 — Purge flow seen while the purge valve should be shut, 241,402–281,635 km: 14 repairs, about 6 times the rest of the fleet, at least 5.2 times",
    );
    expect(mail.text).toContain(
      "- Aurel Merlin M2 · Power distribution → Body ground strap, 120,701–160,934 km: 28 repairs, no repairs of this in the rest of the fleet in this band, at least 28 times its rate",
    );
    expect(mail.text).not.toMatch(/∞|\de-\d|×/);
  });

  test("at risk: below one a chance with its range (1 − e^−λ), the horizon in the organisation's unit", () => {
    // 1 − e^−0.48 = 0.381, 1 − e^−0.2 = 0.181, 1 − e^−0.7 = 0.503 (computed)
    expect(mail.text).toContain("VEHICLES MOST AT RISK OVER THEIR NEXT 10,000 KM");
    expect(mail.text).toContain(
      "- T-104: Harsh or flaring shifts — about a 38% chance of a failure, likely between 18% and 50%",
    );
    expect(mail.text).toContain(
      "- T-022: Signal: Fuel vapour → Purge valve — about 3.2 failures (likely 1.1 to 6.4)",
    );
    expect(mail.text).toContain("- P0300 — Random misfire: 1 vehicle back\n");
    // How often the fix held, the one definition (lib/fix-held.ts) the screens show.
    expect(mail.text).toContain(
      "- Fuel vapour → Purge valve: 3 vehicles back; overall, the fix held in 81 of 263 repairs (31%), likely between 26% and 37%",
    );
    expect(mail.text).toContain("“Likely” and “at least” are at 90% confidence");
  });

  test("the HTML part says the same, every value escaped", () => {
    expect(mail.html).toContain("Tidewater &lt;Parcel&gt; Co-op: what changed since 2026-11-30.");
    expect(mail.html).toContain(
      "<li>T-104: Harsh or flaring shifts — about a 38% chance of a failure, likely between 18% and 50%</li>",
    );
    expect(mail.html).toContain('<a href="https://recurra.example/">Open Recurra</a>');
    expect(mail.subject).toBe("Recurra weekly digest: Tidewater <Parcel> Co-op — 2 new signals");
  });
});
