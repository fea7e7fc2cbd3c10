export const fieldActionKeys = {
  all: ['field-actions'] as const,
  list: (state: string | undefined, page: number) => ['field-actions', 'list', state ?? 'all', page] as const,
  one: (number: string) => ['field-actions', 'detail', number] as const,
};
