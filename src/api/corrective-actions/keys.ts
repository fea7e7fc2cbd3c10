export const caKeys = {
  all: ['corrective-actions'] as const,
  list: (state: string | undefined, page: number) => ['corrective-actions', 'list', state ?? 'all', page] as const,
  one: (number: string) => ['corrective-actions', 'detail', number] as const,
  actions: (owner: 'me' | 'anyone', overdue: boolean | undefined) =>
    ['corrective-actions', 'actions', owner, overdue ?? 'any'] as const,
  people: ['corrective-actions', 'people'] as const,
};
