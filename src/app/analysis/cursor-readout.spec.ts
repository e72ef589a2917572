import { importProvidersFrom } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { MatIconTestingModule } from '@angular/material/icon/testing';
import { firstNumber, idealTriodeFamily } from '../../testing/analysis-probes';
import { childLangmuirFigures, WORKED_K } from '../../testing/child-langmuir-points';
import { CursorReadout, cursorReading } from './cursor-readout';

// Check values from the ideal triode (Child-Langmuir law, team reference sheet section 2).
describe('cursorReading', () => {
  it('inverts the family at the pointer for Vg1 and reads gm, ra and mu there', () => {
    const reading = cursorReading(idealTriodeFamily(), { vaVolts: 250, iaMilliamps: 1.25 });
    if (reading.kind !== 'figures') throw new Error(`no figures: ${JSON.stringify(reading)}`);
    const byLabel = Object.fromEntries(reading.figures.map((f) => [f.label, f]));
    expect(reading.place.map((f) => `${f.label} ${f.text} ${f.unit}`)).toEqual([
      'Va 250.0 V',
      'Ia 1.250 mA',
    ]);
    expect(firstNumber(byLabel['Vg1'].text)).toBeCloseTo(-1, 3);
    expect(byLabel['gm'].unit).toBe('mA/V');
    expect(firstNumber(byLabel['gm'].text)).toBeCloseTo(
      childLangmuirFigures(WORKED_K, 100, 250, -1).gmMilliampsPerVolt,
      3,
    );
    expect(byLabel['ra'].unit).toBe('kΩ');
    expect(firstNumber(byLabel['ra'].text)).toBeCloseTo(80, 1);
    expect(byLabel['mu'].unit).toBe('');
    expect(byLabel['gm'].text).toMatch(/ ±\s/);
  });

  it('gives the reason above the measured currents', () => {
    const reading = cursorReading(idealTriodeFamily(), { vaVolts: 100, iaMilliamps: 8 });
    expect(reading.kind).toBe('refused');
    if (reading.kind === 'refused') {
      expect(reading.reason).toMatch(/^Ia 8 mA at Va 100 V is above the highest current/);
    }
  });

  it('is idle with the pointer off the chart', () => {
    expect(cursorReading(idealTriodeFamily(), null)).toEqual({ kind: 'idle' });
  });
});

describe('CursorReadout', () => {
  it('shows the figures with their units, and the reason in place of numbers outside', async () => {
    TestBed.configureTestingModule({
      imports: [CursorReadout],
      providers: [importProvidersFrom(MatIconTestingModule)],
    });
    const fixture = TestBed.createComponent(CursorReadout);
    fixture.componentRef.setInput('family', idealTriodeFamily());
    await fixture.whenStable();
    const host = fixture.nativeElement as HTMLElement;
    expect(host.textContent).toContain('Point at the curves');

    fixture.componentRef.setInput('cursor', { vaVolts: 250, iaMilliamps: 1.25 });
    await fixture.whenStable();
    const text = host.textContent!.replace(/\s+/g, ' ');
    expect(text).toMatch(/gm 1\.2500 ± \S+ mA\/V/);
    expect(text).toMatch(/ra 80\.0\d* ± \S+ kΩ/);
    expect(host.querySelector('.reason')).toBeNull();

    fixture.componentRef.setInput('cursor', { vaVolts: 100, iaMilliamps: 8 });
    await fixture.whenStable();
    expect(host.querySelector('.reason')?.textContent).toContain('above the highest current');
    expect(host.textContent).not.toContain('mA/V');
  });
});
