export const processKeys = {
  all: ['process'] as const,
  partKinds: ['process', 'part-kinds'] as const,
  stages: ['process', 'stages'] as const,
  characteristics: (stage: string | null) => ['process', 'characteristics', stage] as const,
  routes: (family: string) => ['process', 'routes', family] as const,
  compare: (a: number, b: number) => ['process', 'routes', 'compare', a, b] as const,
  castingNumbers: (family: string) => ['process', 'casting-numbers', family] as const,
  imports: ['process', 'imports'] as const,
  characteristicVersions: (id: number) => ['process', 'characteristic-versions', id] as const,
  characteristicCompare: (a: number, b: number) => ['process', 'characteristic-versions', 'compare', a, b] as const,
};
