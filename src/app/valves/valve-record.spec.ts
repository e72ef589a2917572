import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { importProvidersFrom } from '@angular/core';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatIconTestingModule } from '@angular/material/icon/testing';
import { provideRouter } from '@angular/router';
import { provideEchartsCore } from 'ngx-echarts';
import { storeSession, sweepView, VALVE_TYPE_VIEWS } from '../../testing/fixtures';
import { gradeReason } from './grade-reason';
import { photoProblem } from './valve-photos';
import { ValveRecord } from './valve-record';
import { valveView } from './valve-view-fixture';
import type { ValveDetail } from './valves-api';

function detail(): ValveDetail {
  return {
    ...valveView({ grade: 'weak', percentOfNominal: 64 }),
    referencePoint: {
      vaVolts: 250,
      vg2Volts: null,
      vg1Volts: -2,
      iaMilliamps: 1.2,
      gmMicrosiemens: 1600,
    },
    sweeps: [sweepView({ id: 41 }), sweepView({ id: 40 })],
    trend: [
      {
        sweepId: 40,
        at: '2026-11-01T10:00:00Z',
        vaVolts: 250,
        vg1Volts: -2,
        iaMilliamps: 1.1,
        gmMicrosiemens: 1500,
        raKiloohms: 66,
        mu: 99,
        iaPercent: 92,
        gmPercent: 94,
        refusal: null,
      },
      {
        sweepId: 41,
        at: '2026-11-30T10:00:00Z',
        vaVolts: 250,
        vg1Volts: -2,
        iaMilliamps: 0.9,
        gmMicrosiemens: 1024,
        raKiloohms: 90,
        mu: 92,
        iaPercent: 75,
        gmPercent: 64,
        refusal: null,
      },
    ],
  };
}

describe('ValveRecord', () => {
  let fixture: ComponentFixture<ValveRecord>;
  let http: HttpTestingController;
  const element = () => fixture.nativeElement as HTMLElement;

  async function render(role: 'technician' | 'viewer') {
    storeSession(role);
    TestBed.configureTestingModule({
      imports: [ValveRecord],
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
    fixture = TestBed.createComponent(ValveRecord);
    fixture.componentRef.setInput('id', '7');
    fixture.detectChanges();
    await fixture.whenStable();
    http.expectOne('/api/valve-types').flush(VALVE_TYPE_VIEWS);
    http
      .expectOne('/api/settings')
      .flush({ gradeThresholds: { strongMinPercent: 80, fairMinPercent: 65 } });
    http.expectOne('/api/valves/7').flush(detail());
    http
      .expectOne('/api/valves/7/label.svg')
      .flush('<svg xmlns="http://www.w3.org/2000/svg"></svg>');
    await fixture.whenStable();
    http.expectOne('/api/valves/7/photos').flush([]);
    await fixture.whenStable();
  }

  afterEach(() => {
    http.verify();
    localStorage.clear();
  });

  it('names the weaker figure and the operating point in the grade reason', async () => {
    await render('technician');
    const grade = element().querySelector('.grade')!.textContent!;
    expect(grade).toContain('Weak · 64 %');
    expect(grade).toContain('gm 64 % of nominal at 250 V / -2 V');
  });

  it('compares the newest figures with the nominal ones, ra and mu included', async () => {
    await render('technician');
    const rows = [...element().querySelectorAll('table.nominal tbody tr')].map((r) =>
      [...r.querySelectorAll('td')].map((c) => c.textContent!.trim()),
    );
    expect(rows).toEqual([
      ['Ia (mA)', '0.9', '1.2', '75 %'],
      ['gm (mA/V)', '1.02', '1.6', '64 %'],
      ['ra (kΩ)', '90', '62.5', '144 %'],
      ['mu', '92', '100', '92 %'],
    ]);
  });

  it('lists the sweeps newest first with links to them', async () => {
    await render('technician');
    const links = [...element().querySelectorAll('table.sweeps a')].map((a) =>
      a.getAttribute('href'),
    );
    expect(links).toEqual(['/sweeps/41', '/sweeps/40']);
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
  };

  it('names Ia when Ia is the lower percentage, with the screen voltage', () => {
    expect(gradeReason([figures], point)).toBe('Ia 70 % of nominal at 250 V / -13.5 V (Vg2 250 V)');
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
