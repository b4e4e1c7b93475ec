export const monoFont = 'monospace';
