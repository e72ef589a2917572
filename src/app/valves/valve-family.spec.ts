import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatSelectHarness } from '@angular/material/select/testing';
import { MatSlideToggleHarness } from '@angular/material/slide-toggle/testing';
import { By } from '@angular/platform-browser';
import { provideRouter } from '@angular/router';
import { provideEchartsCore } from 'ngx-echarts';
import {
  CHILD_LANGMUIR_PLAN,
  childLangmuirFigures,
  childLangmuirPoints,
  WORKED_K,
} from '../../testing/child-langmuir-points';
import { sweepView, VALVE_TYPE_VIEWS } from '../../testing/fixtures';
import { SweepChart } from '../sweeps/sweep-chart';
import type { NominalCurves, TypeView } from '../types/types-api';
import { ValveFamily } from './valve-family';

const AX7 = VALVE_TYPE_VIEWS.find((t) => t.designation === '12AX7') as unknown as TypeView;

// Ideal triode readings (Child-Langmuir law) stand in for a measured 12AX7 family: the
// figures the panel shows can then be checked against exact values.
const POINTS = childLangmuirPoints(WORKED_K, 100, CHILD_LANGMUIR_PLAN);
const FAMILY = {
  plan: CHILD_LANGMUIR_PLAN,
  status: 'complete' as const,
  pointCount: POINTS.length,
};

const NONE: NominalCurves = {
  designation: '12AX7',
  source: null,
  uploadedBy: null,
  uploadedAt: null,
  curves: [],
};

const UPLOADED: NominalCurves = {
  designation: '12AX7',
  source: 'Workshop digitised sheet, fig. 4',
  uploadedBy: 'admin',
  uploadedAt: '2026-11-20T09:00:00Z',
  curves: [0, -1, -2].map((vg1Volts) => ({
    vg1Volts,
    points: [0, 100, 200, 300].map((vaVolts) => ({
      vaVolts,
      iaMilliamps: Math.max(0, vaVolts / 100 + vg1Volts),
      ig2Milliamps: null,
    })),
  })),
};

describe('ValveFamily', () => {
  let fixture: ComponentFixture<ValveFamily>;
  let http: HttpTestingController;
  const element = () => fixture.nativeElement as HTMLElement;
  const overlays = () =>
    fixture.debugElement.query(By.directive(SweepChart)).componentInstance.overlays() as {
      name?: string;
    }[];

  async function render(sweeps: ReturnType<typeof sweepView>[], stored = NONE) {
    TestBed.configureTestingModule({
      imports: [ValveFamily],
      providers: [
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        provideEchartsCore({ echarts: () => import('../echarts-setup') }),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(ValveFamily);
    fixture.componentRef.setInput('sweeps', sweeps);
    fixture.componentRef.setInput('type', AX7);
    fixture.detectChanges();
    await fixture.whenStable();
    http.expectOne('/api/valve-types/12AX7/nominal-curves').flush(stored);
    const families = sweeps.filter((s) => s.plan.kind === 'anode' && s.pointCount > 0);
    const newest = families.find((s) => s.plan.section !== 2) ?? families[0];
    if (newest) http.expectOne(`/api/sweeps/${newest.id}`).flush({ ...newest, points: POINTS });
    await fixture.whenStable();
  }

  afterEach(() => http.verify());

  it('draws the newest family over the published model, with the figures at each point', async () => {
    await render([
      sweepView({ id: 42, plan: { ...CHILD_LANGMUIR_PLAN, kind: 'transfer' }, pointCount: 9 }),
      sweepView({ id: 41, ...FAMILY }),
      sweepView({ id: 40, ...FAMILY }),
    ]);
    expect(element().textContent).toContain('Sweep #41 of');
    expect(element().textContent).toContain('published model (Koren 1996) at each measured Vg1');
    expect(overlays().length).toBe(CHILD_LANGMUIR_PLAN.vg1Volts.length);
    expect(overlays()[0].name).toBe('Published model (Koren 1996)');

    const captions = [...element().querySelectorAll('table.figures caption')].map((c) =>
      c.textContent!.replace(/\s+/g, ' ').trim(),
    );
    expect(captions).toEqual([
      'Reference point: Va 250 V, Vg1 -2 V',
      'Operating point: Va 100 V, Vg1 -1 V',
    ]);
    const reference = [...element().querySelectorAll('table.figures')][0];
    const gm = [...reference.querySelectorAll('tbody tr')]
      .map((r) => [...r.children].map((c) => c.textContent!.trim()))
      .find((cells) => cells[0] === 'gm (mA/V)')!;
    // Exact: the ideal triode's gm at 250 V / -2 V; nominal 1.6 mA/V (RCA data sheet).
    const exact = childLangmuirFigures(WORKED_K, 100, 250, -2).gmMilliampsPerVolt;
    expect(Number(gm[1])).toBeCloseTo(exact, 2);
    expect(gm[2]).toBe('1.6');
    expect(gm[3]).toBe(`${Math.round((exact / 1.6) * 100)} %`);
  });

  it('names the uploaded curves and their upload, and hides them with the toggle', async () => {
    await render([sweepView({ id: 41, ...FAMILY })], UPLOADED);
    const note = element().querySelector('.nominal-note')!.textContent!.replace(/\s+/g, ' ');
    expect(note).toContain('the 12AX7 nominal curves uploaded to the library');
    expect(note).toContain('Source: Workshop digitised sheet, fig. 4.');
    expect(note).toContain('Uploaded 2026-11-20 by admin.');
    expect(overlays().map((o) => o.name)).toEqual(
      Array(3).fill('Nominal (Workshop digitised sheet, fig. 4)'),
    );
    // Ia on the uploaded -2 V curve at 250 V: 250/100 - 2 = 0.5 mA (the test's own curves).
    expect(element().textContent).toContain('On the uploaded nominal curve: Ia 0.5 mA here');

    const loader = TestbedHarnessEnvironment.loader(fixture);
    await (await loader.getHarness(MatSlideToggleHarness.with({ label: 'Show nominal' }))).toggle();
    expect(overlays()).toEqual([]);
  });

  it('shows another sweep of the valve when the user picks it', async () => {
    await render([sweepView({ id: 41, ...FAMILY }), sweepView({ id: 40, ...FAMILY })]);
    const loader = TestbedHarnessEnvironment.loader(fixture);
    const select = await loader.getHarness(MatSelectHarness);
    await select.open();
    const options = await select.getOptions();
    expect(options.length).toBe(2);
    await options[1].click();
    http.expectOne('/api/sweeps/40').flush({ ...sweepView({ id: 40, ...FAMILY }), points: POINTS });
    await fixture.whenStable();
    expect(element().textContent).toContain('Sweep #40 of');
  });

  it('shows section 1 of a double triode first, and labels section 2 in the choice', async () => {
    const second = sweepView({ id: 51, ...FAMILY, plan: { ...FAMILY.plan, section: 2 } });
    await render([second, sweepView({ id: 50, ...FAMILY })]);
    expect(element().textContent).toContain('Sweep #50 of');
    const select = await TestbedHarnessEnvironment.loader(fixture).getHarness(MatSelectHarness);
    await select.open();
    const texts = await Promise.all((await select.getOptions()).map((o) => o.getText()));
    expect(texts[0]).toContain('section 2');
    expect(texts[1]).not.toContain('section 2');
  });

  it('says what to do when the valve has no anode family yet', async () => {
    await render([sweepView({ id: 42, plan: { ...CHILD_LANGMUIR_PLAN, kind: 'transfer' } })]);
    expect(element().textContent).toContain('No anode family of this valve yet.');
    expect(element().querySelector('app-sweep-chart')).toBeNull();
  });
});
