import { describe, expect, test } from "vitest";
import { describeDateOrder, detectDateOrder, readBothWays } from "@/lib/import/date-order";

// Sources: the calendar (what a date reads as each way round) and "Recurra's rule" (when the
// file decides and when the user is asked: lib/import/date-order.ts).

const cells = (column: string, values: string[]) => values.map((value) => ({ column, value }));

describe("readBothWays", () => {
  test("03/04/2025 is 3 April 2025 day first or 4 March 2025 month first", () => {
    expect(readBothWays({ column: "Opened", value: "03/04/2025" })).toEqual({
      column: "Opened",
      value: "03/04/2025",
      dayFirst: "3 April 2025",
      monthFirst: "4 March 2025",
    });
    // A day above 12 reads one way only; a time after the date is ignored.
    expect(readBothWays({ column: "At", value: "25/12/2024 08:30" })).toMatchObject({
      dayFirst: "25 December 2024",
      monthFirst: null,
    });
  });
});

describe("detectDateOrder", () => {
  test("all days ≤ 12: ask, with three distinct samples, those that read differently first", () => {
    // Recurra's rule
    const order = detectDateOrder(
      cells("Opened", [
        "03/03/2025",
        "03/04/2025",
        "03/04/2025",
        "05/06/2025",
        "01/02/2025",
        "07/08/2025",
      ]),
    );
    expect(order).toEqual({
      status: "ask",
      isConflict: false,
      samples: [
        {
          column: "Opened",
          value: "03/04/2025",
          dayFirst: "3 April 2025",
          monthFirst: "4 March 2025",
        },
        {
          column: "Opened",
          value: "05/06/2025",
          dayFirst: "5 June 2025",
          monthFirst: "6 May 2025",
        },
        {
          column: "Opened",
          value: "01/02/2025",
          dayFirst: "1 February 2025",
          monthFirst: "2 January 2025",
        },
      ],
    });
    expect(describeDateOrder(order, "mdy")).toBe(
      "The dates in “Opened” (for example 03/04/2025 and 05/06/2025) fit both day/month/year and month/day/year. Choose the order.",
    );
  });

  test("one day above 12 decides, in any date column, whatever the others say", () => {
    // Recurra's rule
    const order = detectDateOrder([
      ...cells("Opened", ["03/04/2025", "05/06/2025"]),
      ...cells("Closed", ["13/06/2025"]),
    ]);
    expect(order).toEqual({
      status: "decided",
      format: "dmy",
      count: 1,
      sample: { column: "Closed", value: "13/06/2025", dayFirst: "13 June 2025", monthFirst: null },
    });
  });

  test("ISO dates and months as words need no order; nothing to sample is said as such", () => {
    // ISO 8601; a month word reads the same either way (Recurra's rule)
    expect(detectDateOrder(cells("Opened", ["2025-03-04", "2025-04-03"]))).toEqual({
      status: "iso",
    });
    expect(detectDateOrder(cells("Opened", ["2025-03-04", "03/04/2025"])).status).toBe("ask");
    expect(detectDateOrder(cells("Opened", ["5 Mar 2024", "05-Mar-24"]))).toEqual({
      status: "none",
    });
    expect(describeDateOrder({ status: "none" }, "dmy")).toBe(
      "No dates to learn the order from; reading them as day/month/year.",
    );
  });
});
