/**
 * Matching a file's header row to the canonical columns of an import kind, checking a mapping
 * the user edited, and guessing which kind a file is.
 */
import { IMPORT_KINDS, type ImportKind } from "@/db/schema/operations";
import {
  IMPORT_COLUMNS,
  VEHICLE_KEY_REQUIREMENT,
  needsVehicleKey,
  type ColumnSpec,
} from "./columns";

/** Canonical key → 0-based header index, or null when the column is not in the file. */
export type ColumnMapping = Record<string, number | null>;

export type AutoMapResult = {
  mapping: ColumnMapping;
  /** Non-empty headers that no canonical column took. */
  unmatchedHeaders: string[];
  /** Required keys not found; VEHICLE_KEY_REQUIREMENT when neither vin nor unit_number is. */
  missingRequired: string[];
  /** Header names (as written first) that occur more than once after normalisation. */
  duplicateHeaders: string[];
};

/** Words that all mean "number" in a header: "RO #", "RO No.", "RO Number", "RO Nr". */
const NUMBER_WORDS = new Set(["no", "number", "num", "nbr", "nr", "nro"]);
const PLURAL_NUMBER_WORDS = new Set(["nos", "numbers", "nums", "nbrs"]);

/** Units and currencies people append to a header: "Odometer (km)", "Parts cost USD". */
const UNIT_WORDS = new Set([
  "km",
  "kms",
  "mi",
  "mile",
  "miles",
  "kilometres",
  "kilometers",
  "l",
  "lt",
  "ltr",
  "ltrs",
  "litre",
  "litres",
  "liter",
  "liters",
  "gal",
  "gals",
  "gallon",
  "gallons",
  "us",
  "imp",
  "usg",
  "usd",
  "eur",
  "gbp",
  "cad",
  "aud",
  "nzd",
  "chf",
]);

const BOM = "\uFEFF";
const DIACRITICS = /[\u0300-\u036f]/g;
const CAMEL_BOUNDARY = /([a-z0-9])([A-Z])/g;
const NON_ALNUM = /[^a-z0-9]+/g;
const BRACKETED = /[([{][^)\]}]*[)\]}]/g;

/**
 * A header reduced to lower-case words: BOM, accents, case, camelCase, snake_case, spacing and
 * punctuation are dropped, and "#", "no", "number", "num", "nbr", "nr" all become "no".
 * "  RO #\u00a0" → "ro no"; "unitNumber" → "unit no"; "Odometer (km)" → "odometer km".
 */
export function normaliseHeader(header: string): string {
  let s = header.startsWith(BOM) ? header.slice(1) : header;
  s = s.normalize("NFKD").replace(DIACRITICS, "").replace(CAMEL_BOUNDARY, "$1 $2");
  s = s.toLowerCase().replaceAll("#", " no ").replaceAll("&", " and ");
  const words = s.replace(NON_ALNUM, " ").trim().split(" ");
  return words
    .map((w) => (NUMBER_WORDS.has(w) ? "no" : PLURAL_NUMBER_WORDS.has(w) ? "nos" : w))
    .join(" ");
}

/** Looser readings of a header, tried only after every exact match has been placed. */
function looseVariants(header: string): string[] {
  const withoutBrackets = normaliseHeader(header.replace(BRACKETED, " "));
  const withoutUnits = normaliseHeader(header)
    .split(" ")
    .filter((w) => !UNIT_WORDS.has(w))
    .join(" ");
  return [withoutBrackets, withoutUnits].filter((v) => v !== "");
}

/** Normalised synonym (and the key itself) → canonical key, built once per kind. */
const synonymIndexes = new Map<ImportKind, Map<string, string>>();

function synonymIndex(kind: ImportKind): Map<string, string> {
  let index = synonymIndexes.get(kind);
  if (index) return index;
  index = new Map();
  for (const spec of IMPORT_COLUMNS[kind]) {
    for (const word of [spec.key, spec.label, ...spec.synonyms]) {
      const norm = normaliseHeader(word);
      if (!index.has(norm)) index.set(norm, spec.key);
    }
  }
  synonymIndexes.set(kind, index);
  return index;
}

function emptyMapping(kind: ImportKind): ColumnMapping {
  const mapping: ColumnMapping = {};
  for (const spec of IMPORT_COLUMNS[kind]) mapping[spec.key] = null;
  return mapping;
}

/** Required keys (and the vehicle-key group) that the mapping leaves out. */
function missingRequiredKeys(kind: ImportKind, mapping: ColumnMapping): string[] {
  const isMapped = (key: string) => typeof mapping[key] === "number";
  const missing = IMPORT_COLUMNS[kind].filter((c) => c.isRequired && !isMapped(c.key));
  const keys = missing.map((c) => c.key);
  if (needsVehicleKey(kind) && !isMapped("vin") && !isMapped("unit_number")) {
    keys.push(VEHICLE_KEY_REQUIREMENT);
  }
  return keys;
}

/** Non-empty normalised header → the indices where it occurs, for names seen more than once. */
function repeatedHeaders(headers: readonly string[]): Map<string, number[]> {
  const seen = new Map<string, number[]>();
  headers.forEach((h, i) => {
    const norm = normaliseHeader(h);
    if (norm === "") return;
    const at = seen.get(norm);
    if (at) at.push(i);
    else seen.set(norm, [i]);
  });
  for (const [norm, at] of seen) if (at.length < 2) seen.delete(norm);
  return seen;
}

/**
 * Maps each canonical column of `kind` to the first header that names it. Exact (normalised)
 * matches are placed first; then headers with units or bracketed notes removed ("Odometer
 * (km)" → odometer). A header is used for at most one column.
 */
export function autoMapHeaders(kind: ImportKind, headers: readonly string[]): AutoMapResult {
  const index = synonymIndex(kind);
  const mapping = emptyMapping(kind);
  const used = new Set<number>();
  const place = (candidates: (h: string) => string[]) => {
    headers.forEach((header, i) => {
      if (used.has(i)) return;
      for (const candidate of candidates(header)) {
        const key = index.get(candidate);
        if (key !== undefined && mapping[key] === null) {
          mapping[key] = i;
          used.add(i);
          return;
        }
      }
    });
  };
  place((h) => [normaliseHeader(h)]);
  place(looseVariants);
  const unmatchedHeaders = headers.filter((h, i) => !used.has(i) && normaliseHeader(h) !== "");
  const duplicateHeaders = [...repeatedHeaders(headers).values()].map(
    (at) => headers[at[0] as number] as string,
  );
  return {
    mapping,
    unmatchedHeaders,
    missingRequired: missingRequiredKeys(kind, mapping),
    duplicateHeaders,
  };
}

function describeColumn(spec: ColumnSpec | undefined, key: string): string {
  return spec ? `${spec.label} (${key})` : key;
}

/**
 * Problems with a mapping, in words for the person who made it; empty when it can be used.
 * Reports keys the kind does not have, indices that are not a column of the file, one column
 * used for two keys, missing required columns, and mapped columns whose header name occurs
 * more than once in the file (so the user checks the right one was picked).
 */
export function validateMapping(
  kind: ImportKind,
  headers: readonly string[],
  mapping: ColumnMapping,
): string[] {
  const specs = new Map(IMPORT_COLUMNS[kind].map((c) => [c.key, c]));
  const problems: string[] = [];
  const usedBy = new Map<number, string[]>();
  for (const [key, at] of Object.entries(mapping)) {
    const spec = specs.get(key);
    if (!spec) {
      problems.push(`"${key}" is not a column of a ${kind} import.`);
      continue;
    }
    if (at === null || at === undefined) continue;
    if (!Number.isInteger(at) || at < 0 || at >= headers.length) {
      problems.push(
        `${describeColumn(spec, key)} points at column ${String(at + 1)}, but the file has ${headers.length} columns.`,
      );
      continue;
    }
    usedBy.set(at, [...(usedBy.get(at) ?? []), key]);
  }
  for (const [at, keys] of usedBy) {
    if (keys.length > 1) {
      problems.push(
        `Column ${at + 1} ("${headers[at]}") is used for ${keys.join(" and ")}; a column can fill only one.`,
      );
    }
  }
  for (const key of missingRequiredKeys(kind, mapping)) {
    problems.push(
      key === VEHICLE_KEY_REQUIREMENT
        ? "Choose a VIN or a unit number column; every row needs at least one of them."
        : `${describeColumn(specs.get(key), key)} is required; choose the column that holds it.`,
    );
  }
  for (const at of repeatedHeaders(headers).values()) {
    const mappedHere = at.flatMap((i) => usedBy.get(i) ?? []);
    if (mappedHere.length === 0) continue;
    const columns = at.map((i) => i + 1).join(", ");
    problems.push(
      `The file has ${at.length} columns named "${headers[at[0] as number]}" (columns ${columns}); check that ${mappedHere.join(" and ")} uses the right one.`,
    );
  }
  return problems;
}

export type KindGuess = { kind: ImportKind; score: number; missingRequired: string[] };

/** How many kinds have each key: a key found in one kind only says more about the file. */
const keyKindCounts = new Map<string, number>();
for (const kind of IMPORT_KINDS) {
  for (const spec of IMPORT_COLUMNS[kind]) {
    keyKindCounts.set(spec.key, (keyKindCounts.get(spec.key) ?? 0) + 1);
  }
}

/**
 * Ranks the import kinds by how well they explain the headers, best first. The score (0–1) is
 * the share of non-empty headers each kind maps, each weighted by 1 / (number of kinds having
 * that column), times the share of the kind's requirements (vehicle key counted as one) met.
 */
export function guessKind(headers: readonly string[]): KindGuess[] {
  const headerCount = headers.filter((h) => normaliseHeader(h) !== "").length;
  const guesses = IMPORT_KINDS.map((kind): KindGuess => {
    const { mapping, missingRequired } = autoMapHeaders(kind, headers);
    let explained = 0;
    for (const [key, at] of Object.entries(mapping)) {
      if (at !== null) explained += 1 / (keyKindCounts.get(key) ?? 1);
    }
    const requirementCount =
      IMPORT_COLUMNS[kind].filter((c) => c.isRequired).length + (needsVehicleKey(kind) ? 1 : 0);
    const metShare = (requirementCount - missingRequired.length) / requirementCount;
    const score = headerCount === 0 ? 0 : (explained / headerCount) * metShare;
    return { kind, score, missingRequired };
  });
  return guesses.sort((a, b) => b.score - a.score);
}
