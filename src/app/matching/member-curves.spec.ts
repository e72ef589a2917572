import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { getInstanceByDom } from 'echarts/core';
import { provideEchartsCore } from 'ngx-echarts';
import type { SweepPlan } from '../../../shared/domain/sweep';
import { pointsOf, SMALL_PLAN, sweepView } from '../../testing/fixtures';
import { memberColour, memberCurveOverlays, overlayPlan } from './member-curve-series';
import { MemberCurves } from './member-curves';

const families = [
  { label: 'KL-0010', plan: SMALL_PLAN, points: pointsOf(SMALL_PLAN, 5) },
  { label: 'KL-0011', plan: SMALL_PLAN, points: pointsOf(SMALL_PLAN, 5) },
];

describe('memberCurveOverlays', () => {
  it('draws one series per curve of each member, named by the valve label', () => {
    const series = memberCurveOverlays(families, false);
    expect(series.map((s) => s.id)).toEqual([
      'member-0-curve-0',
      'member-0-curve-1',
      'member-0-curve-2',
      'member-1-curve-0',
      'member-1-curve-1',
      'member-1-curve-2',
    ]);
    expect(series.map((s) => s['name'])).toEqual([
      'KL-0010',
      'KL-0010',
      'KL-0010',
      'KL-0011',
      'KL-0011',
      'KL-0011',
    ]);
    expect(series[4]['data']).toEqual(
      pointsOf(SMALL_PLAN, 5)
        .filter((p) => p.curve === 1)
        .map((p) => [p.vaVolts, p.iaMilliamps]),
    );
  });

  it('gives each valve its own colour and every curve of a valve the same one', () => {
    const colours = memberCurveOverlays(families, true).map(
      (s) => (s['lineStyle'] as { color: string }).color,
    );
    expect(new Set(colours.slice(0, 3))).toEqual(new Set([memberColour(0, true)]));
    expect(new Set(colours.slice(3))).toEqual(new Set([memberColour(1, true)]));
    const eight = Array.from({ length: 8 }, (_, i) => memberColour(i, false));
    expect(new Set(eight).size).toBe(8);
  });

  it('orders the points of a curve by their sequence', () => {
    const reversed = [{ ...families[0], points: pointsOf(SMALL_PLAN, 4).reverse() }];
    const first = memberCurveOverlays(reversed, false)[0]['data'] as [number, number][];
    expect(first.map(([va]) => va)).toEqual([0, 50, 100, 150]);
  });

  it('sets the Va axis to the longest sweep and leaves Ig2 out of the axis name', () => {
    const pentode: SweepPlan = { ...SMALL_PLAN, vaStopVolts: 400, vg2Volts: 250 };
    const plan = overlayPlan([families[0], { ...families[1], plan: pentode }]);
    expect(plan?.vaStopVolts).toBe(400);
    expect(plan?.vg2Volts).toBe(0);
    expect(overlayPlan([])).toBeNull();
  });
});

describe('MemberCurves', () => {
  it("fetches each member's sweep and overlays the curves with a legend by label", async () => {
    TestBed.configureTestingModule({
      imports: [MemberCurves],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        provideEchartsCore({ echarts: () => import('../echarts-setup') }),
      ],
    });
    const http = TestBed.inject(HttpTestingController);
    const fixture = TestBed.createComponent(MemberCurves);
    fixture.componentRef.setInput('members', [
      { label: 'KL-0010', sweepId: 110 },
      { label: 'KL-0011', sweepId: 111 },
      { label: 'KL-0013', sweepId: 113 },
    ]);
    await fixture.whenStable();
    for (const id of [110, 111]) {
      http
        .expectOne(`/api/sweeps/${id}`)
        .flush({ ...sweepView({ id, status: 'complete' }), points: pointsOf(SMALL_PLAN, 5) });
    }
    http.expectOne('/api/sweeps/113').flush({}, { status: 404, statusText: 'Not Found' });
    await fixture.whenStable();
    const element = fixture.nativeElement as HTMLElement;
    expect(element.querySelector('[role="alert"]')?.textContent).toContain('No curves for KL-0013');

    const host = element.querySelector('.chart') as HTMLElement;
    const option = () => getInstanceByDom(host)?.getOption();
    await vi.waitFor(() => expect((option()?.['series'] as unknown[]) ?? []).toHaveLength(6), {
      timeout: 5000,
    });
    expect((option()!['legend'] as { data: string[] }[])[0].data).toEqual(['KL-0010', 'KL-0011']);
    http.verify();
  });
});
