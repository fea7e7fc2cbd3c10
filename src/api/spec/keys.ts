/** Family codes are upper case on the server; keys use that form so one book has one cache entry. */
export const specKeys = {
  all: ['spec'] as const,
  book: (family: string) => ['spec', 'book', family.toUpperCase()] as const,
  history: (family: string, characteristicId: number) =>
    ['spec', 'history', family.toUpperCase(), characteristicId] as const,
};
