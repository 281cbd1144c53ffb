// ACR TI-RADS feature vocabulary and points (Tessler et al. JACR 2017; CLINICAL.md §3.1).
// "Cannot be determined" rows come from the chart's notes as reproduced secondarily (SRC~).

export type Composition = 'cystic' | 'spongiform' | 'mixed' | 'solid' | 'indeterminate-calcified';
export type Echogenicity = 'anechoic' | 'hyperechoic-or-isoechoic' | 'hypoechoic' | 'very-hypoechoic' | 'indeterminate';
export type Shape = 'wider-than-tall' | 'taller-than-wide';
export type Margin = 'smooth' | 'ill-defined' | 'lobulated-or-irregular' | 'extrathyroidal-extension' | 'indeterminate';
export type EchogenicFocus = 'none-or-comet-tail' | 'macrocalcifications' | 'peripheral-rim' | 'punctate';

interface FeatureOption {
  points: number;
  label: string;
}

export const COMPOSITION: Readonly<Record<Composition, FeatureOption>> = {
  cystic: { points: 0, label: 'cystic or almost completely cystic' },
  spongiform: { points: 0, label: 'spongiform' },
  mixed: { points: 1, label: 'mixed cystic and solid' },
  solid: { points: 2, label: 'solid or almost completely solid' },
  'indeterminate-calcified': { points: 2, label: 'composition not determinable (calcification)' },
};

export const ECHOGENICITY: Readonly<Record<Echogenicity, FeatureOption>> = {
  anechoic: { points: 0, label: 'anechoic' },
  'hyperechoic-or-isoechoic': { points: 1, label: 'hyperechoic or isoechoic' },
  hypoechoic: { points: 2, label: 'hypoechoic' },
  'very-hypoechoic': { points: 3, label: 'very hypoechoic' },
  indeterminate: { points: 1, label: 'echogenicity not determinable' },
};

export const SHAPE: Readonly<Record<Shape, FeatureOption>> = {
  'wider-than-tall': { points: 0, label: 'wider-than-tall' },
  'taller-than-wide': { points: 3, label: 'taller-than-wide' },
};

export const MARGIN: Readonly<Record<Margin, FeatureOption>> = {
  smooth: { points: 0, label: 'smooth margin' },
  'ill-defined': { points: 0, label: 'ill-defined margin' },
  'lobulated-or-irregular': { points: 2, label: 'lobulated or irregular margin' },
  'extrathyroidal-extension': { points: 3, label: 'extrathyroidal extension' },
  indeterminate: { points: 0, label: 'margin not determinable' },
};

export const ECHOGENIC_FOCI: Readonly<Record<EchogenicFocus, FeatureOption>> = {
  'none-or-comet-tail': { points: 0, label: 'no echogenic foci or large comet-tail artefacts' },
  macrocalcifications: { points: 1, label: 'macrocalcifications' },
  'peripheral-rim': { points: 2, label: 'peripheral (rim) calcifications' },
  punctate: { points: 3, label: 'punctate echogenic foci' },
};

/** The five feature groups of one nodule; foci are multi-select and additive. */
export interface TiradsFeatures {
  composition: Composition;
  echogenicity: Echogenicity;
  shape: Shape;
  margin: Margin;
  /** Empty means none; 'none-or-comet-tail' cannot be combined with other foci. */
  foci: readonly EchogenicFocus[];
}
