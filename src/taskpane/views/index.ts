/**
 * Every view of the pane, in the order the job runs: one entry per view. To add a view, write its
 * module in this folder (it exports a `make(ctx): View`) and add one entry here; the navigation,
 * the panel and the keyboard handling follow from the entry.
 */
import type { PaneContext, View } from '../view';
import { libraryView } from './library';
import { fillView } from './fill';
import { whatIfView } from './whatif';
import { qcView } from './qc';
import { summaryView } from './summary';
import { verificationView } from './verification';
import { reviewView } from './review';

/** The steps of the job: the navigation's first row. */
export type StepId = 'specify' | 'verify' | 'control' | 'report';

export interface Step {
  readonly id: StepId;
  readonly label: string;
  /** Said to screen readers with the step's tab. */
  readonly description: string;
}

export const STEPS: readonly Step[] = [
  { id: 'specify', label: 'Specify', description: 'Variation tables, filling sheets with specifications, what-if on tiers' },
  { id: 'verify', label: 'Verify', description: 'Verifying a method against its specification' },
  { id: 'control', label: 'Control', description: 'Designing internal quality control and reviewing control results' },
  { id: 'report', label: 'Report', description: 'The summary sheet' },
];

export interface ViewEntry {
  /** Used in element ids: the tab is `#tab-<id>`, the panel `#panel-<id>`. */
  readonly id: string;
  readonly label: string;
  readonly step: StepId;
  /** Builds the view the first time it is shown; null while the view is not in the pane yet. */
  readonly make: ((ctx: PaneContext) => View) | null;
  /** For a view not in the pane yet: where the work is done meanwhile. */
  readonly meanwhile?: string;
}

export const VIEWS: readonly ViewEntry[] = [
  { id: 'library', label: 'Tables', step: 'specify', make: libraryView },
  { id: 'fill', label: 'Fill', step: 'specify', make: fillView },
  { id: 'whatif', label: 'What-if', step: 'specify', make: whatIfView },
  {
    id: 'verification',
    label: 'Verification',
    step: 'verify',
    make: verificationView,
  },
  { id: 'qc', label: 'QC', step: 'control', make: qcView },
  {
    id: 'review',
    label: 'Review',
    step: 'control',
    make: reviewView,
  },
  { id: 'summary', label: 'Summary', step: 'report', make: summaryView },
];
