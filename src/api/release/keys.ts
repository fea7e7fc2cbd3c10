export const releaseKeys = {
  all: ['release'] as const,
  releaseCheck: (serial: string) => ['release', serial, 'release-check'] as const,
  documents: (serial: string) => ['release', serial, 'documents'] as const,
};
