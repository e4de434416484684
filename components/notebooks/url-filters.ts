"use client";
// Filters kept in the URL's query string, so a filtered view can be shared or reloaded: read them,
// and replace them without a new history entry (typing in a search box should not flood "Back").
import { usePathname, useRouter, useSearchParams } from "next/navigation";
import { useCallback } from "react";

export function useUrlFilters<K extends string>(
  keys: readonly K[],
): [Record<K, string>, (changes: Partial<Record<K, string>>) => void] {
  const router = useRouter();
  const pathname = usePathname();
  const params = useSearchParams();
  const values = Object.fromEntries(keys.map((k) => [k, params.get(k) ?? ""])) as Record<K, string>;
  const update = useCallback(
    (changes: Partial<Record<K, string>>) => {
      const next = new URLSearchParams(params);
      for (const [key, value] of Object.entries(changes) as [K, string | undefined][]) {
        if (value) next.set(key, value);
        else next.delete(key);
      }
      router.replace(`${pathname}${next.size ? `?${next}` : ""}`, { scroll: false });
    },
    [params, pathname, router],
  );
  return [values, update];
}
