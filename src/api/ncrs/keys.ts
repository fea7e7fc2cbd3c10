import type { NcrFilter } from './list-ncrs';

export const ncrKeys = {
  all: ['ncrs'] as const,
  lists: ['ncrs', 'list'] as const,
  list: (filter: NcrFilter) => ['ncrs', 'list', filter] as const,
  one: (number: string) => ['ncrs', 'detail', number] as const,
};
