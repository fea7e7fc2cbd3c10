export const unitKeys = {
  all: ['units'] as const,
  releaseCheck: (serial: string) => ['units', serial, 'release-check'] as const,
};
