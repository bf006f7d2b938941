import { describe, expect, it } from 'vitest';
import { safeFileName } from '../../../src/core/export';

describe('safeFileName', () => {
  it('keeps ordinary lot ids and adds the extension', () => {
    expect(safeFileName('KX2417.1-flagged', 'csv')).toBe('KX2417.1-flagged.csv');
  });
  it('never lets a path separator, a parent folder or a leading dot through', () => {
    expect(safeFileName('../../etc/passwd', 'csv')).toBe('etc_passwd.csv');
    expect(safeFileName('a\\b/c', 'json')).toBe('a_b_c.json');
    expect(safeFileName('.hidden', 'csv')).toBe('hidden.csv');
  });
  // Reserved device names: Microsoft, "Naming Files, Paths, and Namespaces".
  it('avoids names Windows reserves and empty names', () => {
    expect(safeFileName('CON', 'csv')).toBe('_CON.csv');
    expect(safeFileName('lpt1', 'txt')).toBe('_lpt1.txt');
    expect(safeFileName('///', 'csv')).toBe('offstate.csv');
  });
  it('caps the length', () => {
    expect(safeFileName('x'.repeat(500), 'csv').length).toBe(124);
  });
});
