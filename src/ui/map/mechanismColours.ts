// Colours and words for the mechanism call of a flagged die, shared by the map, the plot, the
// lists and the report. Okabe-Ito colours (M. Okabe and K. Ito, "Color Universal Design", 2008),
// which stay apart under the common colour-vision deficiencies.

import type { MechanismKind } from '../../core/analysis/types';

export const MECHANISM_KINDS: readonly MechanismKind[] = ['threshold-shift', 'extra-leakage', 'weak-drive', 'unclassified'];

export const MECHANISM_COLOURS: Record<MechanismKind, string> = {
  'threshold-shift': '#0072B2',
  'extra-leakage': '#D55E00',
  'weak-drive': '#009E73',
  unclassified: '#CC79A7',
};

export const MECHANISM_WORDS: Record<MechanismKind, string> = {
  'threshold-shift': 'threshold shift',
  'extra-leakage': 'extra leakage',
  'weak-drive': 'weak drive',
  unclassified: 'unclassified',
};

export function mechanismWord(kind: MechanismKind | null | undefined): string {
  return kind ? MECHANISM_WORDS[kind] ?? kind : '';
}
