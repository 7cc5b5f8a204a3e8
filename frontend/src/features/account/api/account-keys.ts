/** Cache keys of the signed-in person's own settings. */
export const accountKeys = {
  all: ['account'] as const,
  notifications: () => [...accountKeys.all, 'notifications'] as const,
  tokens: () => [...accountKeys.all, 'tokens'] as const,
};
