/**
 * The library API: every stage of the flow (config → network → cuts → bounds) usable on its own.
 */
export type { Diagnostic, Span } from './diagnostic.js';
export { InputError, formatDiagnosticLine } from './diagnostic.js';
export type * from './config/model.js';
export { loadConfigFile, loadConfigText } from './config/load-config.js';
export type { Partition, PartitionKind } from './partition/partition.js';
export { defaultPartitions, resolvePartition, BUILTIN_KINDS } from './partition/partition.js';
export type { Circuit, LayerTag } from './network/circuit.js';
export { buildCircuit, NODE_LIMIT } from './network/build-circuit.js';
export { circuitToGraph, explicitToGraph } from './network/to-graph.js';
export type { TensorGraph, TensorAttributes, BondAttributes } from './network/to-graph.js';
export { treeMinCut } from './cut/tree-min-cut.js';
export { degreeBound } from './cut/degree-bound.js';
export { computeBounds, analyseLayered } from './cut/bounds.js';
export type * from './cut/types.js';
export { boundsJson } from './report/bounds-json.js';
export { boundsText } from './report/bounds-text.js';
export { run } from './cli/run.js';
