import * as namespace from 'dicom-parser';

/**
 * dicom-parser is a UMD bundle: Node's ESM loader sees only its default export, Vite's browser
 * build may expose both. This picks whichever holds the functions, typed as the package says.
 */
export const dicomParser: typeof namespace = (namespace as unknown as { default?: typeof namespace }).default ?? namespace;

export type { DataSet, Element } from 'dicom-parser';
