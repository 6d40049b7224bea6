import { describe, expect, test } from "vitest";
import {
  CAUTIONS,
  cautionsForComponent,
  cautionsForWork,
  isHighVoltageVehicle,
} from "@/lib/known-issues";

// The usual precautions of the trade for each kind of work (common practice).
describe("cautions by component", () => {
  test("oil service: hot oil and lifting", () => {
    expect(cautionsForComponent("engine-mechanical/oil-service")).toEqual(["hot-parts", "lifting"]);
  });
  test("brakes: lifting and brake dust", () => {
    for (const slug of ["brakes/front-pads", "brakes/discs", "brakes/calipers"])
      expect(cautionsForComponent(slug).sort()).toEqual(["brake-dust", "lifting"]);
  });
  test("fuel and purge work: fuel vapour", () => {
    expect(cautionsForComponent("fuel-vapour/purge-valve")).toContain("fuel-vapour");
    expect(cautionsForComponent("fuel-delivery/fuel-pump")).toContain("fuel-vapour");
  });
  test("sensors and grounds: electrical without the fuse text; fuses get the fuse caution", () => {
    expect(cautionsForComponent("power-distribution/body-ground")).toEqual(["electrical"]);
    expect(cautionsForComponent("steering/assist-sensor")).toContain("electrical");
    expect(cautionsForComponent("steering/assist-sensor")).not.toContain("fuses");
    expect(CAUTIONS.electrical.text).not.toMatch(/fuse/i);
    expect(cautionsForComponent("power-distribution/main-fuse")).toContain("fuses");
    expect(CAUTIONS.fuses.text).toMatch(/bridge a fuse/);
  });
  test("steering-wheel and clock-spring work: the airbag caution", () => {
    expect(cautionsForComponent("restraints/clock-spring")).toContain("airbag-srs");
    expect(cautionsForComponent("restraints/airbag-system")).toContain("airbag-srs");
    expect(CAUTIONS["airbag-srs"].text).toMatch(/clock spring/);
  });
  test("every caution text defers to the manufacturer, local rules or trained people", () => {
    for (const [kind, c] of Object.entries(CAUTIONS)) {
      if (kind === "other") continue;
      expect(c.title.length, kind).toBeGreaterThan(2);
      expect(c.text.length, kind).toBeGreaterThan(40);
    }
    expect(CAUTIONS["high-voltage"].text).toMatch(/manufacturer's procedure/);
  });
});

describe("high voltage", () => {
  test("a hybrid or electric generation, or an engine that says so, is high voltage", () => {
    expect(isHighVoltageVehicle({ powertrain: "hybrid" })).toBe(true);
    expect(isHighVoltageVehicle({ powertrain: "electric" })).toBe(true);
    expect(isHighVoltageVehicle({ powertrain: "combustion", engine: "1.6 petrol" })).toBe(false);
    expect(isHighVoltageVehicle({ engine: "2.0 Hybrid" })).toBe(true);
    expect(isHighVoltageVehicle({ engine: "EV 64 kWh" })).toBe(true);
    expect(isHighVoltageVehicle({ engine: "1.5 TDI" })).toBe(false);
  });
  test("work on a high-voltage vehicle lists the high-voltage caution first, once", () => {
    const list = cautionsForWork(["lifting", "high-voltage"], { isHighVoltage: true });
    expect(list.map((c) => c.kind)).toEqual(["high-voltage", "lifting"]);
    expect(cautionsForWork(["lifting"], { isHighVoltage: false }).map((c) => c.kind)).toEqual([
      "lifting",
    ]);
  });
});
