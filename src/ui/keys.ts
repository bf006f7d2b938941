// Keyboard keys of the app, as a pure mapping from a key press to an action. KEY_TABLE is the one
// list: the mapping and the help overlay both read it, so the help never misses a key.

export type KeyAction =
  | 'next-wafer' | 'previous-wafer' | 'next-param' | 'previous-param' | 'toggle-help' | 'escape'
  | 'next-view' | 'previous-view' | 'view-overview' | 'view-wafer' | 'view-sites' | 'view-fa' | 'view-settings'
  | 'open-wafer' | 'export-csv' | 'export-json' | 'export-png' | 'export-svg' | 'export-report'
  | 'tool-box' | 'tool-lasso' | 'tool-pan' | 'zoom-in' | 'zoom-out' | 'zoom-reset' | 'toggle-theme' | 'add-to-fa';

export interface KeyPress {
  key: string;
  ctrlKey: boolean;
  metaKey: boolean;
  altKey: boolean;
  /** Tag name of the focused element, upper case (INPUT, SELECT, ...). */
  targetTag: string;
}

/** Keys, their action and the words the help overlay shows, grouped as the overlay lists them. */
export const KEY_TABLE: readonly { keys: string[]; action: KeyAction; text: string; group: 'Move' | 'Views' | 'Map' | 'Export' | 'Other' }[] = [
  { keys: ['j', 'ArrowDown'], action: 'next-wafer', text: 'next wafer', group: 'Move' },
  { keys: ['k', 'ArrowUp'], action: 'previous-wafer', text: 'previous wafer', group: 'Move' },
  { keys: ['p'], action: 'next-param', text: 'next parameter', group: 'Move' },
  { keys: ['P'], action: 'previous-param', text: 'previous parameter', group: 'Move' },
  { keys: ['v'], action: 'next-view', text: 'next view', group: 'Views' },
  { keys: ['V'], action: 'previous-view', text: 'previous view', group: 'Views' },
  { keys: ['1'], action: 'view-overview', text: 'lot overview', group: 'Views' },
  { keys: ['2'], action: 'view-wafer', text: 'wafer map and trade-off plot', group: 'Views' },
  { keys: ['3'], action: 'view-sites', text: 'sites and lot trend', group: 'Views' },
  { keys: ['4'], action: 'view-fa', text: 'FA list', group: 'Views' },
  { keys: ['5'], action: 'view-settings', text: 'settings', group: 'Views' },
  { keys: ['o'], action: 'open-wafer', text: 'open the current wafer in the wafer view', group: 'Views' },
  { keys: ['b'], action: 'tool-box', text: 'rectangle selection', group: 'Map' },
  { keys: ['l'], action: 'tool-lasso', text: 'lasso selection', group: 'Map' },
  { keys: ['m'], action: 'tool-pan', text: 'pan a zoomed map', group: 'Map' },
  { keys: ['+', '='], action: 'zoom-in', text: 'zoom in', group: 'Map' },
  { keys: ['-'], action: 'zoom-out', text: 'zoom out', group: 'Map' },
  { keys: ['0'], action: 'zoom-reset', text: 'whole wafer', group: 'Map' },
  { keys: ['a'], action: 'add-to-fa', text: 'add the selected dies to the FA list', group: 'Map' },
  { keys: ['e'], action: 'export-csv', text: 'export the FA list as CSV', group: 'Export' },
  { keys: ['E'], action: 'export-json', text: 'export the FA list as JSON', group: 'Export' },
  { keys: ['g'], action: 'export-png', text: 'save the wafer map as PNG', group: 'Export' },
  { keys: ['G'], action: 'export-svg', text: 'save the wafer map as SVG', group: 'Export' },
  { keys: ['r'], action: 'export-report', text: 'make the one-page PDF report', group: 'Export' },
  { keys: ['t'], action: 'toggle-theme', text: 'light or dark theme', group: 'Other' },
  { keys: ['Escape'], action: 'escape', text: 'clear the die selection, close this help', group: 'Other' },
  { keys: ['?'], action: 'toggle-help', text: 'show or hide this help', group: 'Other' },
];

const BY_KEY = new Map<string, KeyAction>();
for (const entry of KEY_TABLE) for (const key of entry.keys) BY_KEY.set(key, entry.action);

/** Form fields keep their own keys (typing, arrow keys in a select). */
const FIELD_TAGS = new Set(['INPUT', 'SELECT', 'TEXTAREA']);

export function keyAction(press: KeyPress): KeyAction | null {
  if (press.ctrlKey || press.metaKey || press.altKey) return null;
  if (press.key === 'Escape') return 'escape';
  if (FIELD_TAGS.has(press.targetTag)) return null;
  return BY_KEY.get(press.key) ?? null;
}

/** How a key is written in the help: arrows as arrows, Escape as Esc. */
export function keyLabel(key: string): string {
  return ({ ArrowDown: '↓', ArrowUp: '↑', Escape: 'Esc' } as Record<string, string>)[key] ?? key;
}
