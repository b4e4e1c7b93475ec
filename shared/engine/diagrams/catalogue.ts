import { BUBBLE, CHAIN, type Graph, MASS_BUBBLE, MASS_CHAIN, MASS_VERTEX, SUNSET, VERTEX_CORRECTED } from './graphs';
import { type IntegralKit, type MomentumIntegral } from './integrals';

/** A divergent subgraph γ: its own integral (whose pole part is the counterterm) and G/γ. */
export interface Subdivergence {
  title: string;
  subgraph(kit: IntegralKit): MomentumIntegral;
  reduced(kit: IntegralKit): MomentumIntegral;
}

/** A graph with its momentum integral (after infrared rearrangement) and its subdivergences. */
export interface CatalogueEntry {
  graph: Graph;
  integral(kit: IntegralKit): MomentumIntegral;
  rearrangement: string;
  subdivergences: readonly Subdivergence[];
  note?: string;
}

const bubble = (k: IntegralKit) => k.bubble(k.propagator(), k.propagator());
const chain = (k: IntegralKit) => k.inSeries(bubble(k), bubble(k));
const correctedBubble = (k: IntegralKit) => k.bubble(k.inSeries(k.propagator(), bubble(k)), k.propagator());
const sunset = (k: IntegralKit) => k.bubble(bubble(k), k.propagator());

const innerBubble: Subdivergence = { title: 'inner bubble (lines g, h)', subgraph: bubble, reduced: bubble };
const chainBubbles: Subdivergence[] = [
  { title: 'first bubble (lines e, f)', subgraph: bubble, reduced: bubble },
  { title: 'second bubble (lines g, h)', subgraph: bubble, reduced: bubble },
];

const ZERO_MOMENTUM_D = 'momentum p enters at the vertex with legs a, b and leaves at leg d; leg c carries zero momentum (the UV pole part after subtraction does not depend on external momenta, and this choice is infrared finite)';
const ZERO_MOMENTUM_B = 'the insertion carries momentum p, which leaves at leg a; leg b carries zero momentum';

export const CATALOGUE: readonly CatalogueEntry[] = [
  { graph: BUBBLE, integral: bubble, rearrangement: 'channel momentum p through both lines', subdivergences: [] },
  { graph: CHAIN, integral: chain, rearrangement: 'channel momentum p through both bubbles', subdivergences: chainBubbles },
  { graph: VERTEX_CORRECTED, integral: correctedBubble, rearrangement: ZERO_MOMENTUM_D, subdivergences: [innerBubble] },
  {
    graph: SUNSET,
    integral: sunset,
    rearrangement: 'inner bubble of two lines, then a bubble with the third line',
    subdivergences: [],
    note: 'each pair of lines is a logarithmically divergent four-point subgraph, but its reduced graph is a massless tadpole, which vanishes in dimensional regularization',
  },
  { graph: MASS_BUBBLE, integral: bubble, rearrangement: 'the insertion carries momentum p', subdivergences: [] },
  { graph: MASS_CHAIN, integral: chain, rearrangement: 'the insertion carries momentum p through both bubbles', subdivergences: chainBubbles },
  { graph: MASS_VERTEX, integral: correctedBubble, rearrangement: ZERO_MOMENTUM_B, subdivergences: [innerBubble] },
];

export function catalogueUpTo(loops: number): CatalogueEntry[] {
  return CATALOGUE.filter((e) => e.graph.loops <= loops);
}
