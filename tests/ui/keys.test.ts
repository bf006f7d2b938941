// Keyboard keys. Oracle: the key list of the product brief (j/k or ArrowDown/ArrowUp for the
// next/previous wafer, p/P next/previous parameter, ? help) and the KeyboardEvent.key values of
// the W3C UI Events KeyboardEvent key Values specification ("ArrowDown", "Escape").
import { describe, expect, it } from 'vitest';
import { KEY_TABLE, keyAction, type KeyPress } from '../../src/ui/keys';

const press = (key: string, over: Partial<KeyPress> = {}): KeyPress =>
  ({ key, ctrlKey: false, metaKey: false, altKey: false, targetTag: 'BODY', ...over });

describe('keyAction', () => {
  it('steps through wafers with j/k and the arrow keys', () => {
    expect(keyAction(press('j'))).toBe('next-wafer');
    expect(keyAction(press('ArrowDown'))).toBe('next-wafer');
    expect(keyAction(press('k'))).toBe('previous-wafer');
    expect(keyAction(press('ArrowUp'))).toBe('previous-wafer');
  });

  it('steps through parameters with p and P and toggles help with ?', () => {
    expect(keyAction(press('p'))).toBe('next-param');
    expect(keyAction(press('P'))).toBe('previous-param');
    expect(keyAction(press('?'))).toBe('toggle-help');
  });

  it('leaves keys alone in form fields and with modifier keys', () => {
    expect(keyAction(press('j', { targetTag: 'INPUT' }))).toBeNull();
    expect(keyAction(press('ArrowDown', { targetTag: 'SELECT' }))).toBeNull();
    expect(keyAction(press('p', { ctrlKey: true }))).toBeNull();
    expect(keyAction(press('k', { metaKey: true }))).toBeNull();
    expect(keyAction(press('x'))).toBeNull();
  });

  it('lets Escape through everywhere', () => {
    expect(keyAction(press('Escape', { targetTag: 'SELECT' }))).toBe('escape');
  });

  it('switches views with 1 to 5 and v/V, and exports with e, E, g, G and r', () => {
    expect(['1', '2', '3', '4', '5'].map((k) => keyAction(press(k)))).toEqual(['view-overview', 'view-wafer', 'view-sites', 'view-fa', 'view-settings']);
    expect(keyAction(press('v'))).toBe('next-view');
    expect(keyAction(press('V'))).toBe('previous-view');
    expect(['e', 'E', 'g', 'G', 'r'].map((k) => keyAction(press(k)))).toEqual(['export-csv', 'export-json', 'export-png', 'export-svg', 'export-report']);
  });

  it('gives every key of the help table exactly one action', () => {
    const keys = KEY_TABLE.flatMap((e) => e.keys);
    expect(new Set(keys).size).toBe(keys.length);
    for (const entry of KEY_TABLE) for (const key of entry.keys) expect(keyAction(press(key))).toBe(entry.action);
  });
});

