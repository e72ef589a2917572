import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { importProvidersFrom } from '@angular/core';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatIconTestingModule } from '@angular/material/icon/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatDialogHarness } from '@angular/material/dialog/testing';
import { provideRouter, Router } from '@angular/router';
import { provideEchartsCore } from 'ngx-echarts';
import { storeSession, sweepView, VALVE_TYPE_VIEWS } from '../../testing/fixtures';
import { gradeReason } from './grade-reason';
import { photoProblem } from './valve-photos';
import { ValveRecord } from './valve-record';
import { quickTestSummary, valveDetail, valveView } from './valve-view-fixture';
import type { ValveDetail } from './valves-api';

function detail(over: Partial<ValveDetail> = {}): ValveDetail {
  return valveDetail({ sweeps: [sweepView({ id: 41 }), sweepView({ id: 40 })], ...over });
}

/** The hub's grade from a quick test newer than the sweeps. */
const GRADED_BY_TEST: Partial<ValveDetail> = {
  grade: 'strong',
  percentOfNominal: 95,
  gradeSource: 'quick-test',
  gradedAt: '2026-12-01T11:00:40.000Z',
  quickTests: [quickTestSummary()],
};

describe('ValveRecord', () => {
  let fixture: ComponentFixture<ValveRecord>;
  let http: HttpTestingController;
  const element = () => fixture.nativeElement as HTMLElement;

  async function render(role: 'technician' | 'viewer' | 'admin', over: Partial<ValveDetail> = {}) {
    storeSession(role);
    TestBed.configureTestingModule({
      imports: [ValveRecord],
      providers: [
        provideRouter([{ path: 'valves', children: [] }]),
        provideHttpClient(),
        provideHttpClientTesting(),
        provideEchartsCore({ echarts: () => import('../echarts-setup') }),
        importProvidersFrom(MatIconTestingModule),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(ValveRecord);
    fixture.componentRef.setInput('id', '7');
    fixture.detectChanges();
    await fixture.whenStable();
    http.expectOne('/api/valve-types').flush(VALVE_TYPE_VIEWS);
    http
      .expectOne('/api/settings')
      .flush({ gradeThresholds: { strongMinPercent: 80, fairMinPercent: 65 } });
    http.expectOne('/api/valves/7').flush(detail(over));
    http
      .expectOne('/api/valves/7/label.svg')
      .flush('<svg xmlns="http://www.w3.org/2000/svg"></svg>');
    await fixture.whenStable();
    http.expectOne('/api/valves/7/photos').flush([]);
    http.expectOne('/api/valve-types/12AX7/nominal-curves').flush({
      designation: '12AX7',
      source: null,
      uploadedBy: null,
      uploadedAt: null,
      curves: [],
    });
    await fixture.whenStable();
    answerPartners();
  }

  /** The partner panel asks for the valve's partners; this record has none in stock. */
  function answerPartners(): void {
    for (const req of http.match((r) => r.url === '/api/valves/7/partners')) {
      req.flush({ valveId: 7, criteria: {}, partners: [], metricDescription: '' });
    }
  }

  afterEach(() => {
    answerPartners();
    http.verify();
    localStorage.clear();
  });

  it('names the weaker figure and the operating point in the grade reason', async () => {
    await render('technician');
    const grade = element().querySelector('.grade')!.textContent!;
    expect(grade).toContain('Weak · 64 %');
    expect(grade).toContain('gm 64 % of nominal at 250 V / -2 V');
  });

  it('grades by a quick test newer than the sweeps, and says where the grade comes from', async () => {
    await render('technician', GRADED_BY_TEST);
    const grade = element().querySelector('.grade')!.textContent!.replace(/\s+/g, ' ');
    expect(grade).toContain('Strong · 95 %');
    expect(grade).toContain('gm 95 % of nominal (1520 of 1600 uS) at 250 V / -2 V');
    expect(grade).toContain('From quick test #5 of 2026-12-01');
    const tests = element().querySelector('app-valve-quick-tests table')!.textContent!;
    expect(tests).toContain('1.52');
    expect(tests).toContain('0.96');
  });

  it('shows a fault a quick test found as the grade, without a percentage', async () => {
    await render('technician', {
      ...GRADED_BY_TEST,
      grade: 'gassy',
      percentOfNominal: 97,
      quickTests: [
        quickTestSummary({ grade: 'gassy', reason: 'reverse grid current 2.1 uA: gas' }),
      ],
    });
    const grade = element().querySelector('.grade')!.textContent!.replace(/\s+/g, ' ');
    expect(grade).toContain('Gassy reverse grid current 2.1 uA: gas');
    expect(grade).not.toContain('97 %');
  });

  it('draws the trend of the sweeps and the quick tests together', async () => {
    await render('technician', GRADED_BY_TEST);
    const chart = element().querySelector('app-valve-trend-chart [role=img]')!;
    expect(chart.getAttribute('aria-label')).toBe(
      'Trend of gm and Ia over 2 sweeps and 1 quick test; newest gm 1.52 mA/V, Ia 0.96 mA',
    );
  });

  it('looks for partners in stock for this valve', async () => {
    await render('viewer');
    const panel = element().querySelector('app-partner-panel');
    expect(panel).not.toBeNull();
    expect(panel!.closest('section')!.textContent).toContain('Partners in stock');
  });

  it('lists the sweeps newest first with links to them', async () => {
    await render('technician');
    const links = [...element().querySelectorAll('table.sweeps a')].map((a) =>
      a.getAttribute('href'),
    );
    expect(links).toEqual(['/sweeps/41', '/sweeps/40']);
    const gm = [...element().querySelectorAll('table.sweeps tbody tr')].map((r) =>
      r.children[5].textContent!.trim(),
    );
    expect(gm).toEqual(['1.02', '1.5']);
  });

  it('sends only the fields of the record when a technician saves', async () => {
    await render('technician');
    const location = element().querySelector('input[formcontrolname=location]') as HTMLInputElement;
    location.value = 'Drawer D1';
    location.dispatchEvent(new Event('input'));
    await fixture.whenStable();
    const save = [...element().querySelectorAll('button')].find((b) =>
      b.textContent!.includes('Save changes'),
    )!;
    save.click();
    const req = http.expectOne((r) => r.method === 'PATCH' && r.url === '/api/valves/7');
    expect(req.request.body).toMatchObject({
      location: 'Drawer D1',
      type: '12AX7',
      status: 'in-stock',
    });
    req.flush(valveView({ location: 'Drawer D1' }));
    http.expectOne('/api/valves/7').flush(detail());
    http.expectOne('/api/valves/7/label.svg').flush('<svg></svg>');
  });

  it('shows viewers the fields read-only, without a save action', async () => {
    await render('viewer');
    const location = element().querySelector('input[formcontrolname=location]') as HTMLInputElement;
    expect(location.disabled).toBe(true);
    expect(element().textContent).not.toContain('Save changes');
    expect(element().textContent).not.toContain('Delete record');
  });

  it('lets an admin delete the record after a confirmation naming its label', async () => {
    await render('admin');
    const remove = [...element().querySelectorAll('button')].find((b) =>
      b.textContent!.includes('Delete record'),
    )!;
    remove.click();
    await fixture.whenStable();
    const loader = TestbedHarnessEnvironment.documentRootLoader(fixture);
    const dialog = await loader.getHarness(MatDialogHarness);
    expect(await dialog.getTitleText()).toBe('Delete WK-0007?');
    expect(await dialog.getContentText()).toContain('Its 2 sweeps and 0 quick tests stay');
    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Delete WK-0007' }))).click();
    const req = http.expectOne((r) => r.method === 'DELETE' && r.url === '/api/valves/7');
    req.flush(null, { status: 204, statusText: 'No Content' });
    await fixture.whenStable();
    expect(TestBed.inject(Router).url).toBe('/valves');
  });

  it('does not delete when the admin keeps the record', async () => {
    await render('admin');
    [...element().querySelectorAll('button')]
      .find((b) => b.textContent!.includes('Delete record'))!
      .click();
    await fixture.whenStable();
    const loader = TestbedHarnessEnvironment.documentRootLoader(fixture);
    const dialog = await loader.getHarness(MatDialogHarness);
    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Keep the record' }))).click();
    await fixture.whenStable();
    http.expectNone((r) => r.method === 'DELETE');
  });
});

describe('photoProblem', () => {
  it('refuses files that are not JPEG, PNG or WebP, and files over 5 MiB', () => {
    expect(photoProblem({ name: 'a.gif', type: 'image/gif', size: 10 })).toContain('not a JPEG');
    expect(photoProblem({ name: 'a.jpg', type: 'image/jpeg', size: 6 * 1024 * 1024 })).toContain(
      '5 MiB',
    );
    expect(photoProblem({ name: 'a.png', type: 'image/png', size: 1000 })).toBeNull();
  });
});

describe('gradeReason', () => {
  const point = {
    vaVolts: 250,
    vg2Volts: 250,
    vg1Volts: -13.5,
    iaMilliamps: 100,
    gmMicrosiemens: 11000,
  };
  const figures = {
    sweepId: 1,
    at: '2026-11-01T10:00:00Z',
    vaVolts: 250,
    vg1Volts: -13.5,
    iaMilliamps: 70,
    gmMicrosiemens: 9000,
    raKiloohms: null,
    mu: null,
    iaPercent: 70,
    gmPercent: 82,
    refusal: null,
    extendedVolts: 0,
  };

  it("names Ia when the grade's percentage is Ia's, with the screen voltage", () => {
    expect(gradeReason([figures], point, 70)).toBe(
      'Ia 70 % of nominal at 250 V / -13.5 V (Vg2 250 V)',
    );
  });

  it('names gm when the percentage does not tell, as the hub grades by gm where known', () => {
    expect(gradeReason([figures], point)).toBe('gm 82 % of nominal at 250 V / -13.5 V (Vg2 250 V)');
  });

  it('gives the reason of the newest sweep when it has no figures', () => {
    const refused = {
      ...figures,
      iaPercent: null,
      gmPercent: null,
      refusal: 'gm is undefined there',
    };
    expect(gradeReason([refused], point)).toBe(
      'No figures from the newest sweep: gm is undefined there.',
    );
  });
});
