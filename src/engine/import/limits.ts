/**
 * Limits on what an import reads, checked before a file is read whole (the task pane on the
 * selected file's size, the command line on the file's size and kind) and again by the importer.
 * Beyond them a file is refused with a message, never read in part.
 */
export const IMPORT_LIMITS = {
  /** Largest file, in bytes: 100 MiB (104,857,600 bytes). */
  maxBytes: 100 * 1024 * 1024,
  /**
   * Most columns a row may use, counted up to its last non-empty cell: 200. Empty cells after the
   * last value (a spreadsheet saving a wide, mostly empty range) do not count and are not kept.
   */
  maxColumns: 200,
  /** Most rows, the header included: 1,048,576, the rows of one Excel worksheet. */
  maxRows: 1_048_576,
} as const;

/** "104,857,600 bytes (100 MiB)" style text for messages. */
export function describeBytes(n: number): string {
  const mib = n / (1024 * 1024);
  const grouped = String(n).replace(/\B(?=(\d{3})+(?!\d))/g, ',');
  return `${grouped} bytes (${mib >= 10 ? Math.round(mib) : Math.round(mib * 10) / 10} MiB)`;
}
