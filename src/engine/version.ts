/** The program version written into every filled sheet's provenance. Kept equal to package.json by a test. */
export const VERSION = '0.1.0';
