export * from './cells';
export * from './dependencies';
export * from './jobs';
export * from './api';
export * from './exports';
export * from './datasets';
