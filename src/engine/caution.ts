/** The caution, shown in the task pane, the README and every filled sheet. */
export const CAUTION =
  'These figures support, and do not replace, the judgement of the laboratory director. Quality ' +
  'specifications, control rules and uncertainty estimates must be set and approved under the ' +
  "laboratory's own quality system and local regulations and accreditation rules; " +
  'biological-variation data must come from a critically appraised source.';

/** The marker every output built from the demo data carries. */
export const DEMO_MARKER = 'DEMO — invented data, not for clinical use';
