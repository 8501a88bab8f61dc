import { useGrowers } from '@/features/register/api/get-growers';

/**
 * Growers as the people pages need them (the people feature cannot read the register itself): the list
 * to assign from, and a lookup from id to name. Archived growers still name themselves.
 */
export function useGrowerOptions() {
  const all = useGrowers({ archived: 'true' });
  const list = all.data ?? [];
  const names = new Map(list.map((g) => [g.id, g.name]));
  return {
    isPending: all.isPending,
    options: list.filter((g) => !g.archivedAt).map((g) => ({ id: g.id, name: g.name })),
    nameOf: (id: string) => names.get(id) ?? 'Unknown grower',
  };
}
