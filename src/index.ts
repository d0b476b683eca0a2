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
export type { Policy, Requirement, NamedPartition, UnprovenMode } from './policy/policy.js';
export { loadPolicyDirectory, loadPolicyFile, loadPolicyText, policyApplies } from './policy/load-policy.js';
export { evaluatePolicy, verdictOf } from './policy/evaluate.js';
export type { PolicyResult, RequirementResult, RequirementVerdict } from './policy/evaluate.js';
export { searchFixes } from './policy/fix-search.js';
export type { Fix } from './policy/fix-search.js';
export { diffModels } from './config/model-diff.js';
export type { FieldChange } from './config/model-diff.js';
export { runCheck, CheckRequestError } from './check/run-check.js';
export type { CheckRequest, CheckOutcome, CheckedConfig, RequirementDelta, SkippedPath } from './check/run-check.js';
export { writeReport, ReportWriteError } from './check/write-report.js';
export { findingsOf } from './check/findings.js';
export type { Finding, FindingRule } from './report/finding.js';
export { checkJson } from './report/check-json.js';
export { checkText, explainRequirement } from './report/check-text.js';
export { sarifText, sarifLog } from './report/sarif.js';
export { junitReport, junitXml } from './report/junit.js';
export { boundsPicture, checkPicture } from './report/picture-html.js';
export { TOOL_VERSION } from './version.js';
