import {
  decimalsForUncertainty,
  formatEstimate,
  formatFixed,
  formatPower,
  parseTypedNumber,
  reasonSentence,
} from './format-readout';

/** The expected text, with the no-break space that keeps ± with its number. */
const pm = (text: string) => text.replace('± ', '±\u00a0');

describe('formatEstimate', () => {
  it('rounds the value to the second significant figure of its uncertainty', () => {
    expect(formatEstimate({ value: 51.848980707, uncertainty: 1.5005757 })).toBe(pm('51.8 ± 1.5'));
    expect(formatEstimate({ value: 90.97384, uncertainty: 0.0257691 })).toBe(pm('90.974 ± 0.026'));
  });

  it('scales µS to mA/V', () => {
    expect(formatEstimate({ value: 1779.891, uncertainty: 45.044 }, 1e-3)).toBe(
      pm('1.780 ± 0.045'),
    );
  });

  it('stops at five significant figures and says when the uncertainty is smaller', () => {
    expect(formatEstimate({ value: 1.2499998, uncertainty: 1.6e-7 })).toBe(pm('1.2500 ± <0.0001'));
    expect(formatEstimate({ value: 100.648, uncertainty: 0.0203 })).toBe(pm('100.65 ± 0.02'));
  });

  it('marks an unknown uncertainty and writes infinity for a flat curve', () => {
    expect(formatEstimate({ value: 2.5, uncertainty: Infinity }, 1, 1)).toBe(pm('2.5 ± ?'));
    expect(formatEstimate({ value: Infinity, uncertainty: Infinity })).toBe('∞');
    expect(formatEstimate({ value: -1, uncertainty: 0 }, 1, 2)).toBe('-1.00');
  });
});

describe('the other readout helpers', () => {
  it('never write minus zero', () => {
    expect(formatFixed(-0.00004, 3)).toBe('0.000');
    expect(formatFixed(-0.4, 0)).toBe('0');
    expect(formatFixed(NaN, 2)).toBe('—');
  });

  it('pick decimals for two significant figures of an uncertainty', () => {
    expect(decimalsForUncertainty(0.045)).toBe(3);
    expect(decimalsForUncertainty(1.5)).toBe(1);
    expect(decimalsForUncertainty(120)).toBe(0);
  });

  it('write power in mW below a watt and in W above', () => {
    expect(formatPower(0.01411)).toEqual({ text: '14.1', unit: 'mW' });
    expect(formatPower(12.345)).toEqual({ text: '12.35', unit: 'W' });
  });

  it('read typed numbers with a decimal comma or a typographic minus, and refuse the rest', () => {
    expect(parseTypedNumber('1,5')).toBe(1.5);
    expect(parseTypedNumber('\u22122.25')).toBe(-2.25);
    expect(parseTypedNumber(' 250 ')).toBe(250);
    expect(parseTypedNumber('-')).toBeNull();
    expect(parseTypedNumber('2 V')).toBeNull();
    expect(parseTypedNumber('')).toBeNull();
  });

  it('turn a refusal reason into a sentence', () => {
    expect(reasonSentence('va 320 V is above the range')).toBe('Va 320 V is above the range.');
  });
});
