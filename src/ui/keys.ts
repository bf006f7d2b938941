// Keyboard keys of the app, as a pure mapping from a key press to an action.

export type KeyAction = 'next-wafer' | 'previous-wafer' | 'next-param' | 'previous-param' | 'toggle-help' | 'escape';

export interface KeyPress {
  key: string;
  ctrlKey: boolean;
  metaKey: boolean;
  altKey: boolean;
  /** Tag name of the focused element, upper case (INPUT, SELECT, ...). */
  targetTag: string;
}

/** Form fields keep their own keys (typing, arrow keys in a select). */
const FIELD_TAGS = new Set(['INPUT', 'SELECT', 'TEXTAREA']);

export function keyAction(press: KeyPress): KeyAction | null {
  if (press.ctrlKey || press.metaKey || press.altKey) return null;
  if (press.key === 'Escape') return 'escape';
  if (FIELD_TAGS.has(press.targetTag)) return null;
  switch (press.key) {
    case 'j': case 'ArrowDown': return 'next-wafer';
    case 'k': case 'ArrowUp': return 'previous-wafer';
    case 'p': return 'next-param';
    case 'P': return 'previous-param';
    case '?': return 'toggle-help';
    default: return null;
  }
}
