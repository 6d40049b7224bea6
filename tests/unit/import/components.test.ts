import { describe, expect, test } from "vitest";

import { COMPONENTS } from "@/db/seed/reference";
import { buildComponentIndex, componentKey, matchComponent } from "@/lib/import/components";

// Sources: Recurra's own component list (db/seed/reference.ts); matching rules are
// "Recurra's rule" (lib/import/components.ts).

const LIST = COMPONENTS.map((c, i) => ({ id: i + 1, ...c }));
const idOf = (slug: string) => LIST.find((c) => c.slug === slug)?.id;
const NO_ALIASES = new Map<string, number>();

describe("componentKey", () => {
  test("slug, arrow form and slash form read alike", () => {
    // Recurra's rule
    expect(componentKey("fuel-vapour/purge-valve")).toBe("fuel vapour purge valve");
    expect(componentKey("Fuel vapour → Purge valve")).toBe("fuel vapour purge valve");
    expect(componentKey("FUEL VAPOR / PURGE VALVE")).toBe("fuel vapour purge valve");
    expect(componentKey("Starting & charging")).toBe("starting and charging");
  });
});

describe("buildComponentIndex", () => {
  const lookup = buildComponentIndex(
    LIST,
    new Map([
      ["PV-01", 2],
      ["battery", 3],
    ]),
  );

  test("slug, system → name, system/name, any case and spacing", () => {
    // Recurra's rule
    const purge = idOf("fuel-vapour/purge-valve");
    expect(lookup("fuel-vapour/purge-valve")).toBe(purge);
    expect(lookup("Fuel vapour → Purge valve")).toBe(purge);
    expect(lookup("fuel vapour/purge valve")).toBe(purge);
    expect(lookup("  FUEL VAPOR -> PURGE VALVE ")).toBe(purge);
    expect(lookup("Starting and charging → Alternator")).toBe(idOf("starting-charging/alternator"));
  });

  test("the name alone when only one component has it", () => {
    // Recurra's rule
    expect(lookup("Thermostat")).toBe(idOf("cooling/thermostat"));
    expect(lookup("purge valve")).toBe(idOf("fuel-vapour/purge-valve"));
  });

  test("an organisation alias, which wins over a bare name", () => {
    // Recurra's rule: the organisation's own codes map onto the list
    expect(lookup("pv-01")).toBe(2);
    expect(lookup("Battery")).toBe(3); // alias, though "Battery" is also a component name
    expect(lookup("starting-charging/battery")).toBe(idOf("starting-charging/battery"));
  });

  test("unknown, blank and ambiguous text match nothing", () => {
    // Recurra's rule
    const twoSystems = [
      { id: 1, slug: "a/sensor", system: "A", name: "Sensor" },
      { id: 2, slug: "b/sensor", system: "B", name: "Sensor" },
    ];
    const ambiguous = buildComponentIndex(twoSystems);
    expect(ambiguous("Sensor")).toBeNull();
    expect(ambiguous("B → Sensor")).toBe(2);
    expect(lookup("flux capacitor")).toBeNull();
    expect(lookup("")).toBeNull();
    expect(lookup(null)).toBeNull();
    expect(lookup(" / ")).toBeNull();
  });
});

describe("matchComponent", () => {
  test("same answers as the index, with the index built once per list and aliases", () => {
    // Recurra's rule
    expect(matchComponent("Cooling → Water pump", LIST, NO_ALIASES)).toBe(
      idOf("cooling/water-pump"),
    );
    expect(matchComponent("nothing", LIST, NO_ALIASES)).toBeNull();
    const aliases = new Map([["WP", idOf("cooling/water-pump") ?? 0]]);
    expect(matchComponent("wp", LIST, aliases)).toBe(idOf("cooling/water-pump"));
    expect(matchComponent("wp", LIST, NO_ALIASES)).toBeNull();
  });
});
