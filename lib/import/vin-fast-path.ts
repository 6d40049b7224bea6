/**
 * A quick yes for the common case of a clean, valid VIN, so that a million rows need not run
 * the full check of lib/vin.ts one by one. Anything it does not accept goes to checkVin, which
 * decides and explains.
 *
 * The transliteration values and position weights of 49 CFR 565.15 (tables IV and V) are not
 * copied here: they are read back from lib/vin.ts through vinWeightedSum when this module loads.
 */
import { vinWeightedSum } from "@/lib/vin";

const ALLOWED = "0123456789ABCDEFGHJKLMNPRSTUVWXYZ";
const ZEROS = "0".repeat(17);

/** Weight of each position: a lone "1" there makes the weighted sum equal to the weight. */
const WEIGHTS = Int32Array.from({ length: 17 }, (_, i) =>
  vinWeightedSum(`${ZEROS.slice(0, i)}1${ZEROS.slice(i + 1)}`),
);

/** Value of each allowed character code (-1 for every other code, lower case included). */
const VALUES = new Int32Array(128).fill(-1);
for (const ch of ALLOWED) {
  VALUES[ch.charCodeAt(0)] = vinWeightedSum(`${ch}${ZEROS.slice(1)}`) / (WEIGHTS[0] as number);
}

const X = 88;
const SEQUENCE = "12345678901234567";

/**
 * True only when `s` is exactly a 17-character upper-case VIN of allowed characters whose check
 * digit is right and which is not a placeholder (one character repeated, or 1234…567); that is,
 * when checkVin(s) would report it well-formed, valid and not a placeholder, with vin === s.
 */
export function isCleanValidVin(s: string): boolean {
  if (s.length !== 17 || s === SEQUENCE) return false;
  const first = s.charCodeAt(0);
  let isOneCharacter = true;
  let sum = 0;
  for (let i = 0; i < 17; i++) {
    const c = s.charCodeAt(i);
    const v = c < 128 ? (VALUES[c] as number) : -1;
    if (v < 0) return false;
    sum += v * (WEIGHTS[i] as number);
    if (c !== first) isOneCharacter = false;
  }
  if (isOneCharacter) return false;
  const r = sum % 11;
  return s.charCodeAt(8) === (r === 10 ? X : 48 + r);
}
