/**
 * Colours that stay distinct for readers with colour-vision deficiencies (the Okabe–Ito
 * palette; common practice in scientific graphics). Effects always appear in the same colours:
 * direct, indirect, induced.
 */
export const EFFECT_COLOURS = {
  direct: '#0072B2',
  indirect: '#E69F00',
  induced: '#009E73',
} as const;

export const SERIES_COLOURS = ['#0072B2', '#E69F00', '#009E73', '#CC79A7', '#56B4E9', '#D55E00', '#F0E442', '#000000'];

export const NEGATIVE = '#D55E00';
export const AXIS = '#666666';
export const GRID = '#dddddd';
export const INK = '#222222';
