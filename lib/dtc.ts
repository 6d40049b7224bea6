/**
 * Diagnostic trouble codes: the five-character structure of SAE J2012 / ISO 15031-6, the
 * two-byte form of SAE J1979 service $03 and the three-byte form of ISO 14229-1.
 */

export const DTC_AREAS = { P: "powertrain", C: "chassis", B: "body", U: "network" } as const;
export type DtcArea = keyof typeof DTC_AREAS;

export type DtcControl = "generic" | "manufacturer" | "reserved";

export type DtcInfo = {
  code: string;
  area: DtcArea;
  areaName: (typeof DTC_AREAS)[DtcArea];
  control: DtcControl;
  /** Subsystem group for generic P0 codes (third character), in Recurra's words. */
  subsystem?: string;
  /** ISO 14229-1 failure-type byte, two hex digits, when the code carried one. */
  failureType?: string;
};

const DTC_PATTERN = /^([PCBU])([0-3])([0-9A-F])([0-9A-F]{2})(?:-([0-9A-F]{2}))?$/;

/** Third character of P0 codes, SAE J2012 §5 (wording Recurra's own). */
const P0_SUBSYSTEMS: Readonly<Record<string, string>> = {
  "0": "fuel and air metering, auxiliary emission controls",
  "1": "fuel and air metering",
  "2": "fuel and air metering (injector circuit)",
  "3": "ignition system or misfire",
  "4": "auxiliary emission controls",
  "5": "vehicle speed, idle control and auxiliary inputs",
  "6": "computer and output circuits",
  "7": "transmission",
  "8": "transmission",
  "9": "transmission",
  A: "hybrid propulsion",
  B: "hybrid propulsion",
  C: "hybrid propulsion",
};

export function normaliseDtc(raw: string): string {
  return raw.trim().toUpperCase();
}

/** Who controls the code, from its letter and second character (SAE J2012). */
function controlOf(area: DtcArea, second: string, third: string): DtcControl {
  if (area === "P") {
    if (second === "0" || second === "2") return "generic";
    if (second === "1") return "manufacturer";
    // P3000–P33FF manufacturer, P3400–P3FFF generic.
    return parseInt(third, 16) <= 3 ? "manufacturer" : "generic";
  }
  if (second === "0") return "generic";
  if (second === "1" || second === "2") return "manufacturer";
  return "reserved"; // B3, C3, U3: sources disagree
}

/** Parses a code like "P0441" or "C0031-23"; returns null when it is not a valid DTC. */
export function parseDtc(raw: string): DtcInfo | null {
  const code = normaliseDtc(raw);
  const m = DTC_PATTERN.exec(code);
  if (!m) return null;
  const [, letter, second, third, , failureType] = m as unknown as [
    string,
    DtcArea,
    string,
    string,
    string,
    string | undefined,
  ];
  const base = code.slice(0, 5);
  const info: DtcInfo = {
    code: base,
    area: letter,
    areaName: DTC_AREAS[letter],
    control: controlOf(letter, second, third),
  };
  if (letter === "P" && second === "0") info.subsystem = P0_SUBSYSTEMS[third];
  if (failureType) info.failureType = failureType;
  return info;
}

export function isValidDtc(raw: string): boolean {
  return parseDtc(raw) !== null;
}

const AREA_BITS: readonly DtcArea[] = ["P", "C", "B", "U"];

/**
 * Decodes the two-byte form of SAE J1979 service $03: top two bits the letter (00 P, 01 C,
 * 10 B, 11 U), next two bits the second character, then three hex digits. Returns null for the
 * 00 00 padding pair.
 */
export function decodeDtcBytes(high: number, low: number): string | null {
  for (const b of [high, low]) {
    if (!Number.isInteger(b) || b < 0 || b > 0xff) {
      throw new Error("decodeDtcBytes: each byte must be an integer from 0 to 255");
    }
  }
  if (high === 0 && low === 0) return null;
  const letter = AREA_BITS[high >> 6] as DtcArea;
  const second = (high >> 4) & 0x3;
  const rest = (((high & 0x0f) << 8) | low).toString(16).toUpperCase().padStart(3, "0");
  return `${letter}${second}${rest}`;
}

/**
 * Encodes a five-character DTC to its two bytes (inverse of decodeDtcBytes). Throws on a code
 * with an ISO 14229-1 failure-type suffix: two bytes have no room for it.
 */
export function encodeDtcBytes(raw: string): [number, number] {
  const info = parseDtc(raw);
  if (!info) throw new Error(`encodeDtcBytes: ${JSON.stringify(raw)} is not a DTC`);
  if (info.failureType !== undefined) {
    throw new Error(
      `encodeDtcBytes: ${JSON.stringify(raw)} has a failure-type byte; two bytes cannot hold it`,
    );
  }
  const c = info.code;
  const high =
    (AREA_BITS.indexOf(info.area) << 6) | (Number(c[1]) << 4) | parseInt(c[2] as string, 16);
  return [high, parseInt(c.slice(3, 5), 16)];
}

/** Decodes the ISO 14229-1 three-byte form, e.g. 0x403123 → "C0031-23". */
export function decodeDtcThreeBytes(value: number): string {
  if (!Number.isInteger(value) || value < 0 || value > 0xffffff) {
    throw new Error("decodeDtcThreeBytes: value must be a 24-bit unsigned integer");
  }
  const code = decodeDtcBytes(value >> 16, (value >> 8) & 0xff) ?? "P0000";
  const failure = (value & 0xff).toString(16).toUpperCase().padStart(2, "0");
  return `${code}-${failure}`;
}

/** Splits a free-text list of codes ("P0441; P0496 p0455") into valid and invalid entries. */
export function splitDtcList(raw: string | null | undefined): {
  valid: string[];
  invalid: string[];
} {
  const valid: string[] = [];
  const invalid: string[] = [];
  for (const token of (raw ?? "").split(/[\s;,]+/).filter(Boolean)) {
    const info = parseDtc(token);
    if (info) {
      if (!valid.includes(info.code)) valid.push(info.code);
    } else invalid.push(token);
  }
  return { valid, invalid };
}
