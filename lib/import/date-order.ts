/**
 * Which way round a file writes its dates: day/month/year or month/day/year. The file decides
 * when one of its sampled dates has a day above 12 (it can only be read one way); otherwise,
 * when both orders read every sampled date, the user is asked, with sample dates read both
 * ways: the order is never guessed. Year-first dates (ISO 8601) and months written as words
 * need no order.
 */
import { parseDate, type DateFormat } from "./values";

/** A date cell of the sampled rows, with the header of its column. */
export type DateCell = { column: string; value: string };

/** A sampled date read both ways: "3 April 2025", or null where that order reads no date. */
export type DateReading = DateCell & { dayFirst: string | null; monthFirst: string | null };

export type DateOrder =
  /** No date with an order to learn (none sampled, or months written as words). */
  | { status: "none" }
  /** Year first: read the same whatever the order. */
  | { status: "iso" }
  /** A date that fits one order only decides it. */
  | { status: "decided"; format: "dmy" | "mdy"; sample: DateReading; count: number }
  /**
   * Ask the user: every sampled date fits both orders (`samples`: up to three, read both
   * ways), or some fit day/month/year only and others month/day/year only (`isConflict`).
   */
  | { status: "ask"; isConflict: boolean; samples: DateReading[] };

const MONTHS = [
  "January",
  "February",
  "March",
  "April",
  "May",
  "June",
  "July",
  "August",
  "September",
  "October",
  "November",
  "December",
];

/** "2025-04-03" → "3 April 2025". */
function spelledOut(iso: string | null): string | null {
  if (!iso) return null;
  const [y, m, d] = iso.split("-").map(Number);
  return `${d} ${MONTHS[(m ?? 1) - 1]} ${y}`;
}

/** A date cell read day first and month first, e.g. 03/04/2025 → 3 April 2025 or 4 March 2025. */
export function readBothWays(cell: DateCell): DateReading {
  return {
    ...cell,
    dayFirst: spelledOut(parseDate(cell.value, "dmy")),
    monthFirst: spelledOut(parseDate(cell.value, "mdy")),
  };
}

/** A leading date: first part, separator, second part (digits or a month word), third part. */
const DATE_SHAPE = /^(\d{1,4})([/.-])(\d{1,2}|[A-Za-z]{3,9})\2(\d{2,4})(?:$|[ T])/;

/** How many sample dates the question shows. */
const SAMPLES = 3;

/**
 * The order of a file's dates from its sampled date cells. `decided` when a first part above
 * 12 (day first) or a second part above 12 (month first) appears and nothing contradicts it;
 * `ask` when every date fits both, or when they contradict each other; `iso` when every date
 * is year first. Dots decide nothing by themselves: 03.04.2025 is read both ways too.
 */
export function detectDateOrder(cells: readonly DateCell[]): DateOrder {
  let iso = 0;
  let dayFirst: DateCell | null = null;
  let monthFirst: DateCell | null = null;
  let dayFirstCount = 0;
  let monthFirstCount = 0;
  const both = new Map<string, DateCell>();
  for (const cell of cells) {
    const m = DATE_SHAPE.exec(cell.value);
    if (!m) continue;
    const [, a = "", , b = ""] = m;
    if (a.length === 4) {
      iso++;
      continue;
    }
    if (!/^\d+$/.test(b)) continue; // month written as a word: no order to learn
    if (Number(a) > 12) {
      dayFirstCount++;
      dayFirst ??= cell;
    } else if (Number(b) > 12) {
      monthFirstCount++;
      monthFirst ??= cell;
    } else if (!both.has(cell.value)) both.set(cell.value, cell);
  }
  if (dayFirst && monthFirst) {
    return {
      status: "ask",
      isConflict: true,
      samples: [readBothWays(dayFirst), readBothWays(monthFirst)],
    };
  }
  const decided = dayFirst ?? monthFirst;
  if (decided) {
    return {
      status: "decided",
      format: dayFirst ? "dmy" : "mdy",
      sample: readBothWays(decided),
      count: dayFirstCount + monthFirstCount,
    };
  }
  if (both.size > 0) {
    // Dates such as 03/03/2025 read the same both ways: shown only when nothing better is there.
    const readings = [...both.values()].map(readBothWays);
    const telling = readings.filter((r) => r.dayFirst !== r.monthFirst);
    const same = readings.filter((r) => r.dayFirst === r.monthFirst);
    return { status: "ask", isConflict: false, samples: [...telling, ...same].slice(0, SAMPLES) };
  }
  return iso > 0 ? { status: "iso" } : { status: "none" };
}

/** True when the user must say which way round the dates are before the import can start. */
export function needsDateOrder(order: DateOrder): boolean {
  return order.status === "ask";
}

/** ‘“Opened” (for example 03/04/2025 and 05/06/2025)’: the columns and values of samples. */
function whereSampled(samples: readonly DateCell[]): string {
  const columns = [...new Set(samples.map((s) => `“${s.column}”`))].join(" and ");
  return `${columns} (for example ${samples.map((s) => s.value).join(" and ")})`;
}

/**
 * Why the file's dates are read as they are, or the question, in words for the mapping step
 * and the command line. `fallback` is the order used where the file gives no clue.
 */
export function describeDateOrder(order: DateOrder, fallback: DateFormat): string {
  switch (order.status) {
    case "none":
      return `No dates to learn the order from; reading them as ${DATE_WORDS[fallback]}.`;
    case "iso":
      return "Dates are year-month-day (ISO 8601).";
    case "decided": {
      const { sample, format } = order;
      const reading = format === "dmy" ? sample.dayFirst : sample.monthFirst;
      return `Dates are read ${DATE_WORDS[format]}: “${sample.column}” has ${sample.value}, which can only be ${reading}.`;
    }
    case "ask":
      return order.isConflict
        ? `Dates disagree: ${whereSampled(order.samples)}; the first fits only day/month/year, the second only month/day/year. Choose the order; rows that do not fit it are rejected.`
        : `The dates in ${whereSampled(order.samples.slice(0, 2))} fit both day/month/year and month/day/year. Choose the order.`;
  }
}

const DATE_WORDS: Record<DateFormat, string> = {
  iso: "year-month-day",
  mdy: "month/day/year",
  dmy: "day/month/year",
};

export function describeDateFormat(format: DateFormat): string {
  return DATE_WORDS[format];
}
