import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { importProvidersFrom } from '@angular/core';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatIconTestingModule } from '@angular/material/icon/testing';
import { provideRouter } from '@angular/router';
import { provideEchartsCore } from 'ngx-echarts';
import { storeSession, VALVE_TYPE_VIEWS } from '../../testing/fixtures';
import { curvesOfCsv } from './nominal-curve-chart';
import { NominalUpload } from './nominal-upload';
import { TypeDetail } from './type-detail';
import type { TypeView } from './types-api';

const CSV = 'va,vg1,ia\n0,0,0\n100,0,1.5\n200,0,3.9\n0,-1,0\n150,-1,1.1\n';

function typeView(): TypeView {
  const base = VALVE_TYPE_VIEWS.find((t) => t.designation === '12AX7')!;
  return {
    ...(base as unknown as TypeView),
    id: 1,
    notes: null,
    hasScreen: false,
    hasModel: true,
    hasNominalCurves: false,
    sources: ['RCA data sheet; high'],
    updatedAt: '2026-11-01T10:00:00Z',
  };
}

describe('TypeDetail', () => {
  let fixture: ComponentFixture<TypeDetail>;
  let http: HttpTestingController;
  const element = () => fixture.nativeElement as HTMLElement;

  async function render(role: 'admin' | 'viewer') {
    storeSession(role);
    TestBed.configureTestingModule({
      imports: [TypeDetail],
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
    fixture = TestBed.createComponent(TypeDetail);
    fixture.componentRef.setInput('designation', '12AX7');
    fixture.detectChanges();
    await fixture.whenStable();
    http.expectOne('/api/valve-types/12AX7').flush(typeView());
    http.expectOne('/api/valve-types/12AX7/nominal-curves').flush({
      designation: '12AX7',
      source: null,
      uploadedBy: null,
      uploadedAt: null,
      curves: [],
    });
    await fixture.whenStable();
  }

  const upload = () =>
    fixture.debugElement.query((d) => d.componentInstance instanceof NominalUpload)
      .componentInstance as NominalUpload;

  afterEach(() => {
    http.verify();
    localStorage.clear();
  });

  it('shows every operating point with its source and confidence', async () => {
    await render('viewer');
    const text = element().textContent!;
    expect(text).toContain('RCA data sheet; high');
    expect(text).toContain('12.6 V');
    expect(element().querySelector('app-nominal-upload')).toBeNull();
    expect(text).not.toContain('Edit type');
  });

  it('shows the line and reason when the hub refuses a nominal-curve file', async () => {
    await render('admin');
    upload().check('va,vg1,ia\n0,0,x\n');
    http
      .expectOne('/api/valve-types/12AX7/nominal-curves/preview')
      .flush(
        { error: { code: 'bad_csv', message: 'line 2: ia "x" is not a number' } },
        { status: 400, statusText: 'Bad Request' },
      );
    await fixture.whenStable();
    expect(element().querySelector('app-nominal-upload .error')!.textContent).toContain(
      'line 2: ia "x" is not a number',
    );
  });

  it('previews the curves with their point counts and saves only with a source', async () => {
    await render('admin');
    upload().check(CSV);
    const req = http.expectOne('/api/valve-types/12AX7/nominal-curves/preview');
    expect(req.request.headers.get('Content-Type')).toBe('text/csv');
    req.flush({
      curves: [
        { vg1Volts: 0, pointCount: 3, vaMinVolts: 0, vaMaxVolts: 200 },
        { vg1Volts: -1, pointCount: 2, vaMinVolts: 0, vaMaxVolts: 150 },
      ],
      pointCount: 5,
      hasScreenCurrent: false,
    });
    await fixture.whenStable();
    const preview = element().querySelector('.preview')!;
    expect(preview.textContent).toMatch(/2\s+curves,\s+5\s+points/);
    expect(preview.querySelectorAll('.counts tbody tr')).toHaveLength(2);
    const save = [...preview.querySelectorAll('button')].find((b) =>
      b.textContent!.includes('Save curves'),
    )!;
    expect(save.disabled).toBe(true);

    const source = preview.querySelector('input') as HTMLInputElement;
    source.value = 'data sheet fig. 4';
    source.dispatchEvent(new Event('input'));
    await fixture.whenStable();
    expect(save.disabled).toBe(false);
    save.click();
    const saved = http.expectOne((r) => r.url === '/api/valve-types/12AX7/nominal-curves');
    expect(saved.request.params.get('source')).toBe('data sheet fig. 4');
    expect(saved.request.body).toBe(CSV);
    saved.flush({
      designation: '12AX7',
      source: 'data sheet fig. 4',
      uploadedBy: 'admin',
      uploadedAt: '2026-12-01T10:00:00Z',
      curves: curvesOfCsv(CSV).map((c) => ({
        vg1Volts: c.vg1Volts,
        points: c.points.map(([va, ia]) => ({ vaVolts: va, iaMilliamps: ia, ig2Milliamps: null })),
      })),
    });
    await fixture.whenStable();
    expect(element().textContent).toContain('Source: data sheet fig. 4');
  });
});

describe('curvesOfCsv', () => {
  it('groups the rows by Vg1 and orders each curve by Va', () => {
    expect(curvesOfCsv('# digitised\nva,vg1,ia\n200,0,3.9\n0,0,0\n\n100,-1,0.4\n')).toEqual([
      {
        vg1Volts: 0,
        points: [
          [0, 0],
          [200, 3.9],
        ],
      },
      { vg1Volts: -1, points: [[100, 0.4]] },
    ]);
  });
});
