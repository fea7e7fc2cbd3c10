import type { PeopleFilter } from './list-people';

export const peopleKeys = {
  all: ['people'] as const,
  list: (filter: PeopleFilter) => ['people', 'list', filter] as const,
};
