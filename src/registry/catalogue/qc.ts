/** QC.DETECT, QC.FALSEREJECT, QC.PLAN: control-rule design (filled in by the QC design work). */
import type { FunctionDef } from '../types';

export const QC_FUNCTIONS: FunctionDef[] = [];
