/** The Fill view's own state, shared by its parts: where to write, how, and what was read. */
import type { FillField, FillMode } from '../../../engine/fill';
import type { TargetSheet } from '../../host';

export type Where = 'new-sheet' | 'range' | 'template';

export interface FillLocal {
  readonly where: Where;
  readonly mode: FillMode;
  /** The active sheet as read before a fill into a range or template. */
  readonly target: TargetSheet | null;
  /** Header text → field chosen by the user (null: leave the column alone). */
  readonly mapping: Readonly<Record<string, FillField | null>>;
  readonly overwrite: boolean;
  readonly append: boolean;
  readonly sheetName: string;
}

export const INITIAL: FillLocal = { where: 'new-sheet', mode: 'live', target: null, mapping: {}, overwrite: false, append: false, sheetName: 'Specifications' };
