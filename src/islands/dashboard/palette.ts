/**
 * Chart colours: the theme's tokens (tailwind.config.mjs) as values, since SVG attributes set by
 * the chart library take colours, not class names.
 */
export const PALETTE = {
  crest600: '#1b7a6c',
  crest300: '#74cfbc',
  ink300: '#9dabbf',
  ink500: '#4c6079',
  ink700: '#2c3b4f',
  ink100: '#e6eaf0',
  dune300: '#eec27a',
  dune500: '#d9922d',
  high600: '#c0422b',
  low600: '#2d63b8',
} as const;

/** One colour per exam status, reading from waiting (cool) to done (brand) and lost (warm). */
export const STATUS_COLOURS = {
  booked: PALETTE.ink300,
  arrived: PALETTE.dune300,
  inProgress: PALETTE.dune500,
  completed: PALETTE.crest600,
  cancelled: PALETTE.ink500,
  noshow: PALETTE.high600,
} as const;

export const AXIS = { stroke: PALETTE.ink300, tick: { fill: PALETTE.ink500, fontSize: 12 } } as const;
