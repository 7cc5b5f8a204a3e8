/** Cache keys of the signed-in person's uploads. */
export const uploadKeys = {
  all: ['uploads'] as const,
  list: () => [...uploadKeys.all, 'list'] as const,
};
