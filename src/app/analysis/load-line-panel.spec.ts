import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import type { HarnessLoader } from '@angular/cdk/testing';
import { importProvidersFrom } from '@angular/core';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatButtonToggleHarness } from '@angular/material/button-toggle/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatFormFieldHarness } from '@angular/material/form-field/testing';
import { MatIconTestingModule } from '@angular/material/icon/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { analyseLoadLine } from '../../../shared/analysis/load-line';
import { firstNumber, idealTriodeFamily, tileText } from '../../testing/analysis-probes';
import { LoadLinePanel } from './load-line-panel';

// The ideal mu-100 triode (Child-Langmuir law, team reference sheet section 2) with K chosen so
// that Va 250 V, Vg1 -1 V carries 1.25 mA with ra 80 kΩ. A 150 kΩ resistor from
// 250 + 1.25 × 150 = 437.5 V puts the operating point exactly there, and the reference sheet's
// section 5 worked example gives the gain: mu·RL/(RL + ra) = 100 × 150/230 = 65.2.
describe('LoadLinePanel', () => {
  let fixture: ComponentFixture<LoadLinePanel>;
  let loader: HarnessLoader;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      imports: [LoadLinePanel],
      providers: [
        importProvidersFrom(MatIconTestingModule),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    fixture = TestBed.createComponent(LoadLinePanel);
    fixture.componentRef.setInput('family', idealTriodeFamily());
    fixture.componentRef.setInput('paMaxWatts', 1);
    await fixture.whenStable();
    loader = TestbedHarnessEnvironment.loader(fixture);
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Draw a load line' }))).click();
  });

  const root = () => fixture.nativeElement as HTMLElement;

  async function type(label: string, value: string) {
    const field = await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: label }));
    await (await field.getControl(MatInputHarness))!.setValue(value);
    await fixture.whenStable();
  }

  async function workedStage(swing: string) {
    await type('Supply', '437.5');
    await type('Load RL', '150');
    await type('Bias Vg1', '-1');
    await type('Grid swing, peak', swing);
  }

  it('starts with a load line the family can answer for', async () => {
    expect(root().querySelector('.refusal')).toBeNull();
    expect(firstNumber(tileText(root(), 'gain'))).toBeGreaterThan(1);
  });

  it('puts the operating point on the curve and the line, and computes the worked gain', async () => {
    await workedStage('0.1');
    expect(tileText(root(), 'va')).toBe('250.0V');
    expect(tileText(root(), 'ia')).toBe('1.250mA');
    expect(tileText(root(), 'vg1')).toBe('-1.00V');
    // 250 V × 1.25 mA = 0.3125 W.
    expect(tileText(root(), 'pa')).toMatch(/^0\.31[23]W$/);
    expect(root().textContent).toContain('31 % of the 1 W rating');
    expect(tileText(root(), 'gain-small')).toBe('65.2');
    // The large-signal gain of a small swing tends to the small-signal one.
    expect(Math.abs(firstNumber(tileText(root(), 'gain')) - 65.2)).toBeLessThanOrEqual(0.1);
  });

  it('shows output swing, power and distortion by the three- and five-point methods', async () => {
    await workedStage('1');
    const expected = analyseLoadLine(
      idealTriodeFamily(),
      { kind: 'resistive', supplyVolts: 437.5, loadKiloohms: 150 },
      { kind: 'fixed', vg1Volts: -1 },
      { gridSwingPeakVolts: 1 },
    );
    if (!expected.ok || !expected.swing) throw new Error('no swing');
    const s = expected.swing;
    expect(tileText(root(), 'swing')).toBe(`${s.outputSwingPeakToPeakVolts.toFixed(1)} V p-p`);
    expect(tileText(root(), 'power')).toBe(`${(1000 * s.outputPowerWatts).toFixed(1)} mW`);
    expect(tileText(root(), 'd2-three')).toBe(`${s.secondHarmonicThreePointPercent.toFixed(2)} %`);
    expect(tileText(root(), 'd2-five')).toBe(`${s.fivePoint.d2Percent.toFixed(2)} %`);
    expect(tileText(root(), 'd3-five')).toBe(`${s.fivePoint.d3Percent.toFixed(2)} %`);
    // Under the 3/2-power law the second harmonic dominates and is about 1 % here.
    expect(s.fivePoint.d2Percent).toBeGreaterThan(0.5);
    expect(s.fivePoint.d3Percent).toBeLessThan(s.fivePoint.d2Percent / 5);
  });

  it('gives the reason when the swing leaves the measured region', async () => {
    await workedStage('5');
    expect(root().querySelector('[data-figure="gain"]')).toBeNull();
    expect(root().querySelector('.refusal')?.textContent).toMatch(/^At a grid swing of 5 V peak: /);
  });

  it('solves cathode bias with Vg1 = -Rk·Ia', async () => {
    await type('Supply', '437.5');
    await type('Load RL', '150');
    await (
      await loader.getHarness(MatButtonToggleHarness.with({ text: 'Cathode resistor' }))
    ).check();
    await fixture.whenStable();
    // Rk = -Vg1/Ik = 1 V / 1.25 mA = 0.8 kΩ (reference sheet section 5); with Rk in the DC
    // path the point moves a little, so Vg1 = -Rk·Ia is checked on the figures shown.
    await type('Cathode Rk (bypassed)', '0.8');
    const ia = firstNumber(tileText(root(), 'ia'));
    const vg1 = firstNumber(tileText(root(), 'vg1'));
    expect(vg1).toBeCloseTo(-0.8 * ia, 2);
    expect(vg1).toBeGreaterThan(-1.05);
    expect(vg1).toBeLessThan(-0.95);
  });

  it('asks for what is missing instead of drawing', async () => {
    await type('Load RL', '');
    expect(root().querySelector('.refusal')?.textContent).toContain('Type the load resistance.');
  });

  it('goes through the marker: the supply becomes Va + Ia·RL at the marker grid voltage', async () => {
    const family = idealTriodeFamily();
    const marker = family.operatingPoint(250, -1);
    if (!marker.ok) throw new Error(marker.reason);
    fixture.componentRef.setInput('marker', marker);
    await fixture.whenStable();
    await type('Load RL', '150');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Through the marker' }))).click();
    await fixture.whenStable();
    const supply = await loader.getHarness(
      MatFormFieldHarness.with({ floatingLabelText: 'Supply' }),
    );
    expect(await (await supply.getControl(MatInputHarness))!.getValue()).toBe('437.5');
    expect(tileText(root(), 'va')).toBe('250.0V');
  });
});
