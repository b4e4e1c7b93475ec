/** Every React Query key in one place, so invalidation after a mutation cannot miss one. */
export const queryKeys = {
  me: ['me'] as const,
  groups: ['groups'] as const,
  group: (groupId: string) => ['groups', groupId] as const,
  capturedMail: ['admin', 'mail'] as const,
};
