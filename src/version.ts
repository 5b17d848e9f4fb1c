/** The program version, written into every output file (keep in step with package.json). */
export const VERSION = '0.1.0';
