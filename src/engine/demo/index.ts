export { demoTable, demoData, DEMO_LAB, DEMO_ANALYSERS, DEMO_SEED, DEMO_SOURCE, REPLICATION_DAYS, REPLICATES_PER_DAY, EQA_SAMPLES, COMPARISON_SAMPLES, reportedDecimals } from './scenario';
export type { DemoAnalyteData, EqaResult, PairedResult, ReplicateResult } from './scenario';
export { DEMO_MARKER } from '../fill/caution';
export { demoControls, demoControlsCsv, CONTROL_EVENTS, CONTROL_MATERIALS, CONTROLS_NOTE, CONTROLS_SEED, CONTROLS_YEAR } from './controls';
export type { DemoControlResult } from './controls';
export { demoVerification, VERIFICATION_SEED, VERIFICATION_MATERIALS } from './verification';
export type { AssignedValue, PrecisionClaim, VerificationAnalyte, VerificationMaterial } from './verification';
