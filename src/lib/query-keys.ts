/** Query keys for one resource, general to specific: `['growers']` → `['growers','list',params]`. */
export function resourceKeys<const R extends string>(resource: R) {
  return {
    all: [resource] as const,
    lists: () => [resource, 'list'] as const,
    list: <P extends object>(params: P) => [resource, 'list', params] as const,
    detail: (id: string) => [resource, 'detail', id] as const,
  };
}
