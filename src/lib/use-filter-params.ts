import { useCallback } from 'react';
import { useSearchParams } from 'react-router-dom';

/**
 * List filters kept in the address (`?growerId=…&archived=true`), so a filtered list can be linked to and
 * survives a reload. Setting a value to '' removes it; `clears` names filters that depend on the one set
 * (a farm belongs to a grower, so changing the grower clears the farm).
 */
export function useFilterParams<K extends string>(names: readonly K[]) {
  const [search, setSearch] = useSearchParams();
  const values = Object.fromEntries(names.map((n) => [n, search.get(n) ?? ''])) as Record<K, string>;
  const setValue = useCallback(
    (name: K, value: string, clears: K[] = []) =>
      setSearch(
        (prev) => {
          const next = new URLSearchParams(prev);
          if (value) next.set(name, value);
          else next.delete(name);
          for (const c of clears) next.delete(c);
          return next;
        },
        { replace: true },
      ),
    [setSearch],
  );
  return [values, setValue] as const;
}
