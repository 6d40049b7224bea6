import { describe, expect, test } from "vitest";
import { certaintyLevel, heatColour, NEUTRAL, SEQUENTIAL, valueBin } from "@/lib/heat-colour";

/** Relative luminance (WCAG 2.x definition), for comparing lightness of colours. */
function luminance(hex: string): number {
  const v = parseInt(hex.slice(1), 16);
  const channel = (c: number) => {
    const s = c / 255;
    return s <= 0.03928 ? s / 12.92 : ((s + 0.055) / 1.055) ** 2.4;
  };
  return (
    0.2126 * channel((v >> 16) & 255) + 0.7152 * channel((v >> 8) & 255) + 0.0722 * channel(v & 255)
  );
}

describe("value-suppressing heat colours (Correll, Moritz & Heer 2018)", () => {
  test("certain cells use the five distinct ramp colours, ordered by lightness", () => {
    const colours = [0, 1, 2, 3, 4].map((b) => heatColour("rate", b, 0));
    expect(colours).toEqual([...SEQUENTIAL]);
    for (let i = 1; i < 5; i++)
      expect(luminance(colours[i]!)).toBeLessThan(luminance(colours[i - 1]!));
  });

  test("value levels merge as certainty drops: 5, 3, 2, then 1 distinct colour", () => {
    const distinct = (c: number) =>
      new Set([0, 1, 2, 3, 4].map((b) => heatColour("rate", b, c))).size;
    expect([0, 1, 2, 3].map(distinct)).toEqual([5, 3, 2, 1]);
  });

  test("the most uncertain colour is close to neutral whatever the value", () => {
    const strong = heatColour("rate", 4, 3);
    const distance = Math.abs(luminance(strong) - luminance(NEUTRAL));
    expect(distance).toBeLessThan(Math.abs(luminance(SEQUENTIAL[4]) - luminance(NEUTRAL)) / 2);
  });

  test("ratio bins are centred on 1", () => {
    expect(valueBin("ratio", 1, 0)).toBe(2);
    expect(valueBin("ratio", 0.3, 0)).toBe(0);
    expect(valueBin("ratio", 10, 0)).toBe(4);
    expect(valueBin("rate", 5, 10)).toBe(2);
    expect(valueBin("rate", 10, 10)).toBe(4);
  });

  test("certainty: the number of value bins the interval spans", () => {
    // Rate bins of width 2 against a maximum of 10.
    expect(certaintyLevel("rate", 4.5, 5.5, 10)).toBe(0);
    expect(certaintyLevel("rate", 3.9, 6.1, 10)).toBe(2);
    expect(certaintyLevel("rate", 0, 15, 10)).toBe(3);
    // Ratio bins edges 0.5, 0.9, 1.5, 4: an open interval above 4 is certain, one from 1.2 is not.
    expect(certaintyLevel("ratio", 12.3, null, 0)).toBe(0);
    expect(certaintyLevel("ratio", 1.2, null, 0)).toBe(2);
    expect(certaintyLevel("ratio", 0.95, 41.97, 0)).toBe(2); // statistics.md §3 example: bins 2 → 4
    expect(certaintyLevel("ratio", 0.2, 41.97, 0)).toBe(3);
    expect(certaintyLevel("ratio", null, 3, 0)).toBe(3);
  });
});
