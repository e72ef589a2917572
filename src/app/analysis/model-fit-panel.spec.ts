import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { importProvidersFrom } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatIconTestingModule } from '@angular/material/icon/testing';
import { korenCurrents, type KorenModel } from '../../../shared/analysis/koren-model';
import { defaultPlan, findValveType } from '../../../shared/catalog/valve-types';
import type { SweepPoint } from '../../../shared/domain/sweep';
import { firstNumber, tileText } from '../../testing/analysis-probes';
import { ModelFitPanel } from './model-fit-panel';

// Readings made with Koren's published 12AX7 set (Glass Audio 8(5), 1996; team reference sheet
// section 2) on the type's default plan, without noise: a fit from a start some way off must
// come back to those parameters with an RMS error of about zero.
const TRUTH = findValveType('12AX7')!.model as KorenModel & { kind: 'triode' };
const PLAN = defaultPlan(findValveType('12AX7')!);

function koren12ax7Points(): SweepPoint[] {
  const out: SweepPoint[] = [];
  PLAN.vg1Volts.forEach((vg1, curve) => {
    for (let va = 0; va <= PLAN.vaStopVolts; va += PLAN.vaStepVolts) {
      const ia = korenCurrents(TRUTH, va, vg1, 0).iaMilliamps;
      out.push({
        seq: out.length,
        curve,
        vaVolts: va,
        vg1Volts: vg1,
        vg2Volts: 0,
        iaMilliamps: ia,
        ig2Milliamps: 0,
      });
      if (ia >= PLAN.iaMaxMilliamps) break;
    }
  });
  return out;
}

/** A blob's text (jsdom's Blob has no text()). */
function readBlob(blob: Blob): Promise<string> {
  return new Promise((resolve, reject) => {
    const reader = new FileReader();
    reader.onload = () => resolve(String(reader.result));
    reader.onerror = () => reject(reader.error);
    reader.readAsText(blob);
  });
}

function render(points: SweepPoint[], start: KorenModel) {
  TestBed.configureTestingModule({
    imports: [ModelFitPanel],
    providers: [
      importProvidersFrom(MatIconTestingModule),
      { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
    ],
  });
  const fixture = TestBed.createComponent(ModelFitPanel);
  fixture.componentRef.setInput('points', points);
  fixture.componentRef.setInput('start', { model: start, source: 'a test start' });
  fixture.componentRef.setInput('designation', '12AX7');
  fixture.componentRef.setInput('sweepId', 7);
  fixture.componentRef.setInput('valveLabel', 'shelf 3');
  return fixture;
}

describe('ModelFitPanel', () => {
  it('warns when the model cannot describe the readings', async () => {
    // A cathode still warming up: each later (more negative) curve carries more current.
    const cold = koren12ax7Points().map((p) => ({
      ...p,
      iaMilliamps: p.iaMilliamps * (0.05 + 0.6 * p.curve),
    }));
    const fixture = render(cold, TRUTH);
    await fixture.whenStable();
    const host = fixture.nativeElement as HTMLElement;
    const loader = TestbedHarnessEnvironment.loader(fixture);
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Fit model' }))).click();
    await vi.waitFor(() => expect(host.querySelector('.verdict')).not.toBeNull(), {
      timeout: 20_000,
    });
    expect(firstNumber(tileText(host, 'rms'))).toBeGreaterThan(5);
    expect(host.querySelector('.verdict')?.getAttribute('data-tone')).toBe('warn');
    expect(host.querySelector('.verdict')?.textContent).toContain('Poor fit');
  });

  it('fits, shows RMS % and parameters with uncertainties, and downloads a SPICE subcircuit', async () => {
    const start: KorenModel = {
      kind: 'triode',
      params: { mu: 85, ex: 1.3, kg1: 1400, kp: 450, kvb: 500 },
    };
    const fixture = render(koren12ax7Points(), start);
    await fixture.whenStable();
    const loader = TestbedHarnessEnvironment.loader(fixture);
    const host = fixture.nativeElement as HTMLElement;
    expect(host.textContent).toContain('starting from a test start');

    await (await loader.getHarness(MatButtonHarness.with({ text: 'Fit model' }))).click();
    await vi.waitFor(() => expect(host.textContent).toContain('Download SPICE model'), {
      timeout: 20_000,
    });
    await fixture.whenStable();

    expect(tileText(host, 'rms')).toBe('0.00%');
    expect(host.querySelector('.verdict')?.textContent).toContain('Close fit.');
    const param = (name: string) =>
      host.querySelector(`[data-param="${name}"] td`)!.textContent!.trim();
    expect(param('MU')).toMatch(/ ±\s/);
    expect(firstNumber(param('MU'))).toBeCloseTo(TRUTH.params.mu, 1);
    expect(firstNumber(param('EX'))).toBeCloseTo(TRUTH.params.ex, 3);
    expect(firstNumber(param('KG1')) / TRUTH.params.kg1).toBeCloseTo(1, 2);
    expect(host.querySelector('[data-param="KG2"]')).toBeNull();
    expect(fixture.componentInstance.shownModel()?.kind).toBe('triode');

    const blobs: Blob[] = [];
    const names: string[] = [];
    const createUrl = vi.fn((blob: Blob) => {
      blobs.push(blob);
      return 'blob:spice';
    });
    Object.assign(URL, { createObjectURL: createUrl, revokeObjectURL: () => {} });
    const click = vi.spyOn(HTMLAnchorElement.prototype, 'click').mockImplementation(function (
      this: HTMLAnchorElement,
    ) {
      names.push(this.download);
    });
    await (
      await loader.getHarness(MatButtonHarness.with({ text: /Download SPICE model/ }))
    ).click();
    click.mockRestore();

    expect(names).toEqual(['12AX7-sweep-7.lib']);
    const text = await readBlob(blobs[0]);
    const lines = text.trim().split('\n');
    expect(lines).toContain('.SUBCKT 12AX7_S7 A G K');
    expect(lines.at(-1)).toBe('.ENDS 12AX7_S7');
    expect(text).toContain('sweep #7 (shelf 3)');
    const mu = Number(/MU=([\d.e+-]+)/.exec(text)?.[1]);
    expect(mu).toBeCloseTo(TRUTH.params.mu, 1);
  });
});
