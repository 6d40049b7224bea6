import { describe, expect, test } from "vitest";
import { isScheduledWork, lineKind } from "@/lib/component-kinds";

const line = (
  correction: string | null,
  complaint: string | null = null,
  extra: Partial<{ cause: string; hasDtc: boolean }> = {},
) => ({ complaint, correction, cause: extra.cause ?? null, hasDtc: extra.hasDtc ?? false });

describe("isScheduledWork (common practice: preventive maintenance lines carry no complaint)", () => {
  test.each([
    "Replaced spark plugs per interval",
    "Scheduled 30k service",
    "Annual inspection, no defects",
    "Timing belt replaced per manufacturer schedule",
    "Oil change and filter",
    "Routine maintenance",
    "Rotated tyres",
  ])("no complaint and %j → scheduled", (correction) => {
    expect(isScheduledWork(line(correction))).toBe(true);
  });

  test.each([
    ["Replaced purge valve", null],
    ["Replaced purge valve per service bulletin", null],
    ["Replaced thermostat per interval", "Engine overheating"],
    ["Inspection found leaking water pump, replaced", null],
    ["Replaced failed coil at scheduled service", null],
  ])("%j (complaint %j) → a repair", (correction, complaint) => {
    expect(isScheduledWork(line(correction, complaint))).toBe(false);
  });

  test("a line with a DTC is never scheduled work", () => {
    expect(isScheduledWork(line("Scheduled service", null, { hasDtc: true }))).toBe(false);
  });

  test("a complaint that itself asks for the scheduled work keeps it scheduled", () => {
    expect(isScheduledWork(line("Changed oil and filter", "Scheduled service"))).toBe(true);
    expect(isScheduledWork(line("Oil and filter", "Oil change and safety check"))).toBe(true);
  });
});

describe("lineKind", () => {
  test("service and wear components give their kind whatever the words", () => {
    expect(lineKind("service", false)).toBe("service");
    expect(lineKind("wear", false)).toBe("wear");
    expect(lineKind("wear", true)).toBe("wear");
  });
  test("a failure component (or none) is a failure unless the line is scheduled work", () => {
    expect(lineKind("failure", false)).toBe("failure");
    expect(lineKind("failure", true)).toBe("service");
    expect(lineKind(null, false)).toBe("failure");
    expect(lineKind(null, true)).toBe("service");
  });
});
