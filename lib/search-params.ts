import type { z } from "zod";

/** What Next.js hands a page as `searchParams`: a key's value, or its values when it repeats. */
export type PageSearchParams = Promise<Record<string, string | string[] | undefined>>;

/**
 * A page's query as one string per key, the shape the request schemas parse: the first value
 * of a repeated key; keys without a value left out, and empty ones too with `dropEmpty`.
 */
export async function queryValues(
  searchParams: PageSearchParams,
  options: { dropEmpty?: boolean } = {},
): Promise<Record<string, string>> {
  const values: Record<string, string> = {};
  for (const [key, value] of Object.entries(await searchParams)) {
    const first = Array.isArray(value) ? value[0] : value;
    if (first === undefined || (options.dropEmpty && first === "")) continue;
    values[key] = first;
  }
  return values;
}

/**
 * The query parsed by `schema`, or the schema's defaults when it does not parse: a link with a
 * bad setting opens the page's default view, and `problem` says why (for the page to show).
 */
export function parseOrDefaults<S extends z.ZodType>(
  schema: S,
  values: Record<string, string>,
): { query: z.output<S>; problem: string | null } {
  const parsed = schema.safeParse(values);
  return parsed.success
    ? { query: parsed.data, problem: null }
    : { query: schema.parse({}), problem: parsed.error.issues[0]?.message ?? "Invalid settings" };
}
