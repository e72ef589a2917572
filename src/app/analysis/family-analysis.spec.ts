import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { importProvidersFrom } from '@angular/core';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatFormFieldHarness } from '@angular/material/form-field/testing';
import { MatIconTestingModule } from '@angular/material/icon/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { getInstanceByDom } from 'echarts/core';
import { provideEchartsCore } from 'ngx-echarts';
import type { SweepPlan } from '../../../shared/domain/sweep';
import {
  childLangmuirPoints,
  CHILD_LANGMUIR_PLAN,
  WORKED_K,
} from '../../testing/child-langmuir-points';
import { pointsOf, SMALL_PLAN, VALVE_TYPE_VIEWS } from '../../testing/fixtures';
import { FamilyAnalysis, findValveType } from './family-analysis';

const POINTS = childLangmuirPoints(WORKED_K, 100, CHILD_LANGMUIR_PLAN);

describe('FamilyAnalysis', () => {
  let fixture: ComponentFixture<FamilyAnalysis>;
  let http: HttpTestingController;

  async function render(plan: SweepPlan, points = POINTS) {
    TestBed.configureTestingModule({
      imports: [FamilyAnalysis],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        importProvidersFrom(MatIconTestingModule),
        provideEchartsCore({ echarts: () => import('../echarts-setup') }),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(FamilyAnalysis);
    fixture.componentRef.setInput('plan', plan);
    fixture.componentRef.setInput('points', points);
    fixture.componentRef.setInput('valveType', 'ECC83');
    fixture.componentRef.setInput('sweepId', 3);
    await fixture.whenStable();
  }

  afterEach(() => http.verify());

  const host = () => fixture.nativeElement as HTMLElement;
  const seriesIds = () => {
    const chart = getInstanceByDom(host().querySelector('.chart') as HTMLElement);
    return ((chart?.getOption()['series'] ?? []) as { id: string }[]).map((s) => s.id);
  };

  it('draws the marker, the load line, its Q point and the type dissipation limit', async () => {
    await render(CHILD_LANGMUIR_PLAN);
    http.expectOne('/api/valve-types').flush(VALVE_TYPE_VIEWS);
    await fixture.whenStable();
    const loader = TestbedHarnessEnvironment.loader(fixture);
    await vi.waitFor(() => expect(seriesIds()).toContain('ia-12'), { timeout: 5000 });
    expect(seriesIds().some((id) => id.startsWith('analysis-'))).toBe(false);

    const field = async (label: string) =>
      (await (
        await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: label }))
      ).getControl(MatInputHarness))!;
    await (await field('Va')).setValue('250');
    await (await field('Vg1')).setValue('-1');
    await vi.waitFor(() => expect(seriesIds()).toContain('analysis-marker'), { timeout: 5000 });

    await (await loader.getHarness(MatButtonHarness.with({ text: 'Draw a load line' }))).click();
    await vi.waitFor(
      () =>
        expect(seriesIds()).toEqual(
          expect.arrayContaining([
            'analysis-pa-max',
            'analysis-ac-line',
            'analysis-quiescent',
            'analysis-swing',
            'analysis-marker',
          ]),
        ),
      { timeout: 5000 },
    );
    // The 12AX7 (found by its equivalent ECC83) is rated 1 W: the label says so.
    const chart = getInstanceByDom(host().querySelector('.chart') as HTMLElement)!;
    const limit = (
      chart.getOption()['series'] as { id: string; endLabel: { formatter: string } }[]
    ).find((s) => s.id === 'analysis-pa-max')!;
    expect(limit.endLabel.formatter).toBe('Pa max 1 W');
    expect(host().querySelector('.key')?.textContent).toContain(
      'Anode dissipation limit, Pa max 1 W',
    );

    // The bench goes on to its next sweep: the tools start afresh.
    fixture.componentRef.setInput('sweepId', 4);
    await fixture.whenStable();
    await vi.waitFor(
      () => expect(seriesIds().some((id) => id.startsWith('analysis-'))).toBe(false),
      { timeout: 5000 },
    );
    expect(host().textContent).toContain('Draw a load line');
    expect(host().querySelector('app-operating-point-panel [data-figure]')).toBeNull();
  });

  it('asks the type library nothing before there is a family, and says what it needs', async () => {
    await render(SMALL_PLAN, pointsOf(SMALL_PLAN, 5).slice(0, 4));
    http.expectNone('/api/valve-types');
    expect(host().querySelector('app-cursor-readout')?.textContent).toContain(
      'No gm, ra or mu yet: an anode family needs at least three curves',
    );
  });

  it('gives a transfer curve the plain chart', async () => {
    await render({ ...SMALL_PLAN, kind: 'transfer', vaStartVolts: 250 }, []);
    expect(host().querySelector('app-sweep-chart')).not.toBeNull();
    expect(host().querySelector('app-cursor-readout')).toBeNull();
    expect(host().querySelector('app-load-line-panel')).toBeNull();
  });
});

describe('findValveType', () => {
  it('finds a type by designation or equivalent, whatever the case', () => {
    expect(findValveType(VALVE_TYPE_VIEWS, '12ax7')?.designation).toBe('12AX7');
    expect(findValveType(VALVE_TYPE_VIEWS, 'ECC83')?.designation).toBe('12AX7');
    expect(findValveType(VALVE_TYPE_VIEWS, 'no such')).toBeNull();
    expect(findValveType(undefined, '12AX7')).toBeNull();
  });
});
