"use client";

import { usePathname, useRouter, useSearchParams } from "next/navigation";
import { useCallback, useMemo } from "react";
import { explorerParams, type ExplorerParams } from "./query-strings";

/** The explorer's state, kept in the address so a view can be shared. */
export function useExplorerParams(): [ExplorerParams, (patch: Partial<ExplorerParams>) => void] {
  const search = useSearchParams();
  const router = useRouter();
  const pathname = usePathname();
  const params = useMemo(() => explorerParams(Object.fromEntries(search.entries())), [search]);
  const set = useCallback(
    (patch: Partial<ExplorerParams>) => {
      const next = new URLSearchParams(search.toString());
      for (const [k, v] of Object.entries(patch)) {
        if (v === undefined || v === "") next.delete(k);
        else next.set(k, v);
      }
      // A new filter starts again at the first page of the ranked list.
      if (!("page" in patch)) next.delete("page");
      router.replace(`${pathname}?${next.toString()}`, { scroll: false });
    },
    [router, pathname, search],
  );
  return [params, set];
}
