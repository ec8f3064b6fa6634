/** DATA and MU families: statistics from the lab's own data (filled in by the statistics work). */
import type { FunctionDef } from '../types';

export const DATA_FUNCTIONS: FunctionDef[] = [];
