export const itemKeys = {
  all: ['items'] as const,
  one: (serial: string) => ['items', serial] as const,
  /** Under the item's own key, so refreshing an item after a station result refreshes its results too. */
  results: (serial: string) => ['items', serial, 'results'] as const,
};
