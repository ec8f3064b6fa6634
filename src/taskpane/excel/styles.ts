/**
 * How each cell role of a fill plan looks in Excel. Plain Office-like styling: bold headers with
 * a rule below, the tier and z cells marked as the cells to change, the demo marker in bold red.
 */
import type { CellRole } from '../../engine/fill';

export interface RoleStyle {
  readonly bold?: boolean;
  readonly italic?: boolean;
  readonly size?: number;
  readonly color?: string;
  readonly fill?: string;
  readonly wrap?: boolean;
  readonly bottomBorder?: boolean;
}

export const ROLE_STYLES: Partial<Record<CellRole, RoleStyle>> = {
  title: { bold: true, size: 14 },
  demo: { bold: true, color: '#C00000' },
  header: { bold: true, bottomBorder: true, wrap: true },
  label: { bold: true },
  tier: { bold: true, fill: '#FFF2CC' },
  z: { bold: true, fill: '#FFF2CC' },
  caution: { italic: true },
};

/** The tier words offered in the tier cell's drop-down list. */
export const TIER_CHOICES = 'optimum,desirable,minimum';

/** Excel column widths are in points; one character of the default font is about 5.6 points wide (common practice, no source). */
export const POINTS_PER_CHARACTER = 5.6;
