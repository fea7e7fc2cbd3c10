export const unitKeys = {
  all: ['units'] as const,
  releaseCheck: (serial: string) => ['units', serial, 'release-check'] as const,
  documents: (serial: string) => ['units', serial, 'documents'] as const,
};
