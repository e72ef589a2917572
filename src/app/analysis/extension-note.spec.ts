import type { OperatingPoint } from '../../../shared/analysis/operating-point';
import { extensionNote } from './operating-point';

describe('extensionNote', () => {
  const op = (extendedVolts: number) => ({ extendedVolts }) as OperatingPoint;

  it('says nothing inside the measurements', () => {
    expect(extensionNote(op(0))).toBeNull();
  });

  it('says how far a cut curve was carried on, and why the figures are less certain', () => {
    expect(extensionNote(op(12.4))).toContain('stopped 12 V short');
    expect(extensionNote(op(4.25))).toContain('stopped 4.3 V short');
    expect(extensionNote(op(4.25))).toContain('less certain');
  });
});
