/**
 * The engine's layers, lowest first (docs/engine.md, "Layers"): a file may import from its own layer and
 * from layers before it in this list, never from a later one. The job contract (shared/jobs/contract,
 * zod only) sits beside them and may be imported by any layer.
 */
export const ENGINE_LAYERS = [
  'precision',
  'special',
  'series',
  'symbolic',
  'integrals',
  'linalg',
  'pade',
  'models',
  'diagrams',
  'flows',
  'fixedpoints',
  'exponents',
  'scans',
  'data',
] as const;

export type EngineLayer = (typeof ENGINE_LAYERS)[number];
