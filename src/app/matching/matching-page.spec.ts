import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { importProvidersFrom } from '@angular/core';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatIconTestingModule } from '@angular/material/icon/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { provideRouter, Router } from '@angular/router';
import { provideEchartsCore } from 'ngx-echarts';
import { storeSession, VALVE_TYPE_VIEWS } from '../../testing/fixtures';
import type { Role } from '../core/auth';
import { matchRun } from './matching-fixtures';
import { MatchingPage } from './matching-page';

describe('MatchingPage', () => {
  let fixture: ComponentFixture<MatchingPage>;
  let http: HttpTestingController;
  const element = () => fixture.nativeElement as HTMLElement;
  const text = (el: Element | null) => (el?.textContent ?? '').replace(/\s+/g, ' ').trim();
  const button = (label: RegExp) =>
    [...element().querySelectorAll('button')].find((b) => label.test(text(b))) ?? null;

  async function render(role: Role, run?: string) {
    storeSession(role);
    TestBed.configureTestingModule({
      imports: [MatchingPage],
      providers: [
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        provideEchartsCore({ echarts: () => import('../echarts-setup') }),
        importProvidersFrom(MatIconTestingModule),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(MatchingPage);
    if (run) fixture.componentRef.setInput('run', run);
    await fixture.whenStable();
    http.expectOne('/api/valve-types').flush(VALVE_TYPE_VIEWS);
    await fixture.whenStable();
  }

  /** Answers the member sweeps the curve panel asks for (drawing is member-curves' spec). */
  async function answerSweeps() {
    await fixture.whenStable();
    for (const req of http.match((r) => r.url.startsWith('/api/sweeps/'))) {
      req.flush({}, { status: 404, statusText: 'Not Found' });
    }
    await fixture.whenStable();
  }

  afterEach(() => {
    http.verify();
    localStorage.clear();
  });

  it("fills the criteria from the chosen type's published operating point", async () => {
    await render('technician');
    const harness = TestbedHarnessEnvironment.loader(fixture);
    const type = await harness.getHarness(MatSelectHarness.with({ selector: '.type mat-select' }));
    await type.open();
    await type.clickOptions({ text: /^EL34/ });
    const value = async (control: string) =>
      (
        await harness.getHarness(
          MatInputHarness.with({ selector: `[formControlName="${control}"]` }),
        )
      ).getValue();
    expect(await value('idleVaVolts')).toBe('250');
    expect(await value('idleVg1Volts')).toBe('-13.5');
    expect(await value('vg2Volts')).toBe('250');
    expect(await value('tolerancePercent')).toBe('5');
    expect(text(element().querySelector('.presets'))).toContain('Usual 5 %');
    expect(text(element().querySelector('.presets'))).toContain('Common practice');
  });

  it('runs the matching, keeps the run in the URL and reserves the chosen group', async () => {
    await render('technician');
    const harness = TestbedHarnessEnvironment.loader(fixture);
    const type = await harness.getHarness(MatSelectHarness.with({ selector: '.type mat-select' }));
    await type.open();
    await type.clickOptions({ text: /^EL34/ });
    button(/Run matching/)!.click();
    const req = http.expectOne('/api/matching/runs');
    expect(req.request.body).toMatchObject({
      valveType: 'EL34',
      groupSize: 4,
      operatingPoints: [{ label: 'idle', vaVolts: 250, vg1Volts: -13.5, vg2Volts: 250 }],
    });
    req.flush(matchRun());
    await answerSweeps();
    expect(TestBed.inject(Router).url).toBe('/?run=12');
    expect(text(element().querySelector('#curves-title'))).toBe('Quad 1: anode curves');

    const navigate = vi.spyOn(TestBed.inject(Router), 'navigate').mockResolvedValue(true);
    button(/Reserve this quad/)!.click();
    const reserve = http.expectOne('/api/match-sets');
    expect(reserve.request.body).toEqual({ runId: 12, groupIndex: 0 });
    reserve.flush({ id: 3 });
    await fixture.whenStable();
    expect(navigate).toHaveBeenCalledWith(['/match-sets', 3]);
  });

  it('says clearly why a set was not reserved when a valve is taken', async () => {
    await render('technician', '12');
    http.expectOne('/api/matching/runs/12').flush(matchRun());
    await answerSweeps();
    button(/Reserve this quad/)!.click();
    http
      .expectOne('/api/match-sets')
      .flush(
        { error: { code: 'valve_unavailable', message: 'KL-0010 is reserved' } },
        { status: 409, statusText: 'Conflict' },
      );
    await fixture.whenStable();
    expect(text(element().querySelector('.curves-panel p.error'))).toBe(
      'Not reserved: KL-0010 is reserved. Run the matching again to group what is still free.',
    );
  });

  it("restores a run from the URL with its criteria, and shows the hub's refusal of a run", async () => {
    await render('technician', '12');
    const run = matchRun({
      criteria: { ...matchRun().criteria, groupSize: 2, tolerancePercent: 3 },
    });
    http.expectOne('/api/matching/runs/12').flush(run);
    await answerSweeps();
    const harness = TestbedHarnessEnvironment.loader(fixture);
    const tolerance = await harness.getHarness(
      MatInputHarness.with({ selector: '[formControlName="tolerancePercent"]' }),
    );
    expect(await tolerance.getValue()).toBe('3');
    expect(text(element().querySelector('h2#result-title'))).toContain('Run #12 · EL34');

    button(/Run matching/)!.click();
    http.expectOne('/api/matching/runs').flush(
      {
        error: {
          code: 'matching_refused',
          message: 'idle: Va 250 V is above the measured range',
        },
      },
      { status: 422, statusText: 'Unprocessable Entity' },
    );
    await fixture.whenStable();
    expect(text(element().querySelector('.error'))).toBe(
      'idle: Va 250 V is above the measured range',
    );
  });

  it('lets a viewer read a run but neither start one nor reserve a set', async () => {
    await render('viewer', '12');
    http.expectOne('/api/matching/runs/12').flush(matchRun());
    await answerSweeps();
    expect(button(/Run matching/)).toBeNull();
    expect(button(/Reserve/)).toBeNull();
    expect(text(element())).toContain('Runs are started by technicians and admins.');
    expect(text(element())).toContain('Sets are reserved by technicians and admins.');
    expect(element().querySelectorAll('li.group')).toHaveLength(2);
  });

  it('explains the metric in a help panel before any run', async () => {
    await render('viewer');
    expect(text(element().querySelector('.help'))).toContain('How the match is measured');
    expect(text(element())).toContain('No run yet.');
  });
});
