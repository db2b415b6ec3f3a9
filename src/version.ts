/** The tool's version, written into every result file. Keep in step with package.json. */
export const VERSION = '0.1.0';
export const TOOL = 'rigcal';
