export const monoFont = 'ui-monospace, SFMono-Regular, Menlo, Consolas, monospace';
