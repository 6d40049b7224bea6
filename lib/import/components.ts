/**
 * Matching the component text of an imported row to Recurra's component list
 * (system → component) and to an organisation's own aliases for it.
 */
import { memoText } from "./memo";

export type ComponentRef = { id: number; slug: string; system: string; name: string };

const DIACRITICS = /[\u0300-\u036f]/g;
const NON_ALNUM = /[^a-z0-9]+/g;
/** US and British spellings that occur in component names. */
const SPELLINGS: ReadonlyMap<string, string> = new Map([
  ["vapor", "vapour"],
  ["tire", "tyre"],
  ["tires", "tyres"],
  ["aluminum", "aluminium"],
]);

/**
 * Lower-case words without punctuation: "Fuel vapour → Purge valve", "fuel-vapour/purge-valve"
 * and "FUEL VAPOR / PURGE VALVE" all read "fuel vapour purge valve"; "&" reads "and".
 */
export function componentKey(text: string): string {
  const words = text
    .normalize("NFKD")
    .replace(DIACRITICS, "")
    .toLowerCase()
    .replaceAll("&", " and ")
    .replace(NON_ALNUM, " ")
    .trim()
    .split(" ");
  return words.map((w) => SPELLINGS.get(w) ?? w).join(" ");
}

export type ComponentLookup = (text: string | null | undefined) => number | null;

/**
 * Builds, once per import, a lookup from component text to component id. Tried in order: the
 * slug, "system → name" (any separator), the organisation's alias (alias text → component id),
 * then the name alone when only one component has it. Case, spacing and punctuation do not
 * matter. A name shared by two systems matches only with its system or an alias.
 */
export function buildComponentIndex(
  components: readonly ComponentRef[],
  aliases: ReadonlyMap<string, number> = new Map(),
): ComponentLookup {
  const exact = new Map<string, number>();
  const byName = new Map<string, number | null>();
  for (const c of components) {
    for (const key of [componentKey(c.slug), componentKey(`${c.system} ${c.name}`)]) {
      if (!exact.has(key)) exact.set(key, c.id);
    }
  }
  for (const [alias, id] of aliases) {
    const key = componentKey(alias);
    if (!exact.has(key)) exact.set(key, id);
  }
  for (const c of components) {
    const key = componentKey(c.name);
    byName.set(key, byName.has(key) ? null : c.id);
  }
  const lookup = memoText((text: string): number | null => {
    const key = componentKey(text);
    if (key === "") return null;
    return exact.get(key) ?? byName.get(key) ?? null;
  });
  return (text) => (text ? lookup(text) : null);
}

const lookups = new WeakMap<
  readonly ComponentRef[],
  WeakMap<ReadonlyMap<string, number>, ComponentLookup>
>();

/**
 * One match, through a lookup built once for each (components, aliases) pair and remembered
 * while both objects live. For bulk work prefer buildComponentIndex.
 */
export function matchComponent(
  text: string | null | undefined,
  components: readonly ComponentRef[],
  aliases: ReadonlyMap<string, number>,
): number | null {
  let byAliases = lookups.get(components);
  if (!byAliases) {
    byAliases = new WeakMap();
    lookups.set(components, byAliases);
  }
  let lookup = byAliases.get(aliases);
  if (!lookup) {
    lookup = buildComponentIndex(components, aliases);
    byAliases.set(aliases, lookup);
  }
  return lookup(text);
}
