export const itemKeys = {
  all: ['items'] as const,
  one: (serial: string) => ['items', serial] as const,
};
