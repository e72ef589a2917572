import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { importProvidersFrom } from '@angular/core';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MatButtonToggleHarness } from '@angular/material/button-toggle/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatFormFieldHarness } from '@angular/material/form-field/testing';
import { MatIconTestingModule } from '@angular/material/icon/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import type { OperatingPoint } from '../../../shared/analysis/operating-point';
import { firstNumber, idealTriodeFamily, tileText, tileUnit } from '../../testing/analysis-probes';
import { childLangmuirFigures, WORKED_K } from '../../testing/child-langmuir-points';
import { muCheck } from './operating-point';
import { OperatingPointPanel } from './operating-point-panel';

// Check values: the ideal triode Ia = K·(Vg1 + Va/mu)^1.5 (Child-Langmuir law; team reference
// sheet section 2) has gm = 1.5·K·√x and ra = mu/gm exactly. K is chosen so that Va 250 V,
// Vg1 -1 V gives mu 100, ra 80 kΩ (the reference sheet's section 5 worked example).
const EXACT = childLangmuirFigures(WORKED_K, 100, 250, -1);

describe('OperatingPointPanel', () => {
  let fixture: ComponentFixture<OperatingPointPanel>;

  async function render() {
    TestBed.configureTestingModule({
      imports: [OperatingPointPanel],
      providers: [
        importProvidersFrom(MatIconTestingModule),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    fixture = TestBed.createComponent(OperatingPointPanel);
    fixture.componentRef.setInput('family', idealTriodeFamily());
    fixture.componentRef.setInput('paMaxWatts', 1);
    await fixture.whenStable();
    return TestbedHarnessEnvironment.loader(fixture);
  }

  const root = () => fixture.nativeElement as HTMLElement;

  async function type(loader: Awaited<ReturnType<typeof render>>, label: string, value: string) {
    const field = await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: label }));
    await (await field.getControl(MatInputHarness))!.setValue(value);
    await fixture.whenStable();
  }

  it('shows Ia in mA, gm in mA/V, ra in kΩ and unitless mu at a typed Va and Vg1', async () => {
    const loader = await render();
    await type(loader, 'Va', '250');
    await type(loader, 'Vg1', '-1');

    const ia = tileText(root(), 'Ia');
    const gm = tileText(root(), 'gm');
    const ra = tileText(root(), 'ra');
    const mu = tileText(root(), 'mu');
    expect(tileUnit(root(), 'Ia')).toBe('mA');
    expect(tileUnit(root(), 'gm')).toBe('mA/V');
    expect(tileUnit(root(), 'ra')).toBe('kΩ');
    expect(tileUnit(root(), 'mu')).toBe('');
    expect(mu).toMatch(/^[\d.]+ ± \S+$/);
    expect(gm).toMatch(/^[\d.]+ ± \S+$/);
    expect(firstNumber(ia)).toBeCloseTo(EXACT.iaMilliamps, 3);
    expect(firstNumber(gm)).toBeCloseTo(EXACT.gmMilliampsPerVolt, 3);
    expect(firstNumber(ra)).toBeCloseTo(80, 1);
    expect(firstNumber(mu)).toBeCloseTo(100, 1);
    expect(root().textContent).toContain('Agrees with mu within the uncertainties');
    // Pa = Va·Ia = 250 V × 1.25 mA = 0.3125 W against the 1 W rating.
    const note = root().querySelector('.note')!.textContent!.replace(/\s+/g, ' ');
    expect(note).toMatch(/^ ?Pa 0\.31[23] W · 31 % of the 1 W rating/);
  });

  it('finds the grid voltage when asked by Va and Ia', async () => {
    const loader = await render();
    await (await loader.getHarness(MatButtonToggleHarness.with({ text: 'Va and Ia' }))).check();
    await type(loader, 'Va', '250');
    await type(loader, 'Ia', '1.25');
    const vg1 = tileText(root(), 'Vg1');
    expect(tileUnit(root(), 'Vg1')).toBe('V');
    expect(firstNumber(vg1)).toBeCloseTo(-1, 3);
  });

  it('gives the reason instead of numbers outside the measured region', async () => {
    const loader = await render();
    await type(loader, 'Va', '250');
    await type(loader, 'Vg1', '-5');
    expect(root().querySelector('[data-figure]')).toBeNull();
    expect(root().querySelector('.refusal')?.textContent).toContain(
      'Vg1 -5 V is below the most negative measured curve (-3 V).',
    );
  });

  it('shows a marker set from the chart in its fields', async () => {
    const loader = await render();
    fixture.componentRef.setInput('request', { by: 'current', vaVolts: 300, iaMilliamps: 2 });
    await fixture.whenStable();
    const ia = await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: 'Ia' }));
    expect(await (await ia.getControl(MatInputHarness))!.getValue()).toBe('2.000');
    const va = await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: 'Va' }));
    expect(await (await va.getControl(MatInputHarness))!.getValue()).toBe('300.0');
    const byCurrent = await loader.getHarness(MatButtonToggleHarness.with({ text: 'Va and Ia' }));
    expect(await byCurrent.isChecked()).toBe(true);
    // 2 mA at 300 V: x = (2/K)^(2/3), Vg1 = x - 3 on the ideal triode.
    expect(firstNumber(tileText(root(), 'Vg1'))).toBeCloseTo((2 / WORKED_K) ** (2 / 3) - 3, 3);
  });
});

describe('muCheck', () => {
  const op = (over: Partial<OperatingPoint>): OperatingPoint =>
    ({
      muMethod: 'va-shift',
      mu: { value: 100, uncertainty: 0.5 },
      muFromGmRa: { value: 100.4, uncertainty: 0.5 },
      ...over,
    }) as OperatingPoint;

  it('agrees within two combined uncertainties', () => {
    expect(muCheck(op({}))).toEqual({
      tone: 'ok',
      sentence: 'Agrees with mu within the uncertainties (0.4 % apart).',
    });
  });

  it('warns when gm·ra and mu differ by more, with the distance in sigmas', () => {
    const check = muCheck(op({ muFromGmRa: { value: 104, uncertainty: 0.5 } }));
    expect(check.tone).toBe('warn');
    expect(check.sentence).toBe('Differs from mu by 4.0 %, 5.7 σ.');
  });

  it('has no independent check where mu itself came from gm·ra', () => {
    expect(muCheck(op({ muMethod: 'gm-ra' })).tone).toBe('neutral');
  });
});
