import { provideHttpClient } from '@angular/common/http';
import {
  HttpTestingController,
  provideHttpClientTesting,
  type TestRequest,
} from '@angular/common/http/testing';
import { importProvidersFrom } from '@angular/core';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import type { HarnessLoader } from '@angular/cdk/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatIconTestingModule } from '@angular/material/icon/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import { provideRouter } from '@angular/router';
import { storeSession } from '../../testing/fixtures';
import { ValveList } from './valve-list';
import { valveView } from './valve-view-fixture';
import type { ValvePage, ValveView } from './valves-api';

describe('ValveList', () => {
  let fixture: ComponentFixture<ValveList>;
  let loader: HarnessLoader;
  let http: HttpTestingController;
  let firstParams: Record<string, string | null>;

  const page = (items: ValveView[]): ValvePage => ({
    items,
    total: items.length,
    page: 1,
    pageSize: 25,
  });
  const nextRequest = (): Promise<TestRequest> =>
    vi.waitFor(() => http.expectOne((r) => r.url === '/api/valves'));
  const params = (req: TestRequest) =>
    Object.fromEntries(req.request.params.keys().map((k) => [k, req.request.params.get(k)]));
  const element = () => fixture.nativeElement as HTMLElement;

  async function render(role: 'technician' | 'viewer') {
    storeSession(role);
    TestBed.configureTestingModule({
      imports: [ValveList],
      providers: [
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        importProvidersFrom(MatIconTestingModule),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(ValveList);
    loader = TestbedHarnessEnvironment.loader(fixture);
    fixture.detectChanges();
    http.expectOne('/api/valve-types').flush([{ designation: '12AX7' }, { designation: 'EL34' }]);
    const first = await nextRequest();
    firstParams = params(first);
    first.flush(
      page([
        valveView(),
        valveView({ id: 8, label: 'WK-0008', grade: null, percentOfNominal: null }),
      ]),
    );
    await fixture.whenStable();
  }

  afterEach(() => {
    http.verify();
    localStorage.clear();
  });

  it('asks for page 1 sorted by label and shows each grade with its percentage', async () => {
    await render('technician');
    expect(firstParams).toEqual({ page: '1', pageSize: '25', sort: 'label', order: 'asc' });
    const rows = await (await loader.getHarness(MatTableHarness)).getRows();
    expect(rows).toHaveLength(2);
    const first = await rows[0].getCellTextByColumnName();
    expect(first).toMatchObject({ label: 'WK-0007', status: 'In stock', grade: 'Fair · 72 %' });
    expect((await rows[1].getCellTextByColumnName())['grade']).toBe('Not graded');
  });

  it('filters by grade on the server', async () => {
    await render('technician');
    const selects = await loader.getAllHarnesses(MatSelectHarness);
    const grade = selects[2];
    await grade.open();
    const chosen = grade.clickOptions({ text: 'Weak' });
    const req = await nextRequest();
    expect(params(req)).toMatchObject({ grade: 'weak', page: '1' });
    req.flush(page([]));
    await chosen;
  });

  it('shows every rejected row of an import with its line and reason', async () => {
    await render('technician');
    const input = element().querySelector('input[type=file]') as HTMLInputElement;
    const file = new File(['label,type\nA,12AX7\n'], 'stock.csv', { type: 'text/csv' });
    Object.defineProperty(input, 'files', { value: [file] });
    input.dispatchEvent(new Event('change'));
    const req = http.expectOne('/api/valves/import');
    expect(req.request.method).toBe('POST');
    req.flush({
      imported: 1,
      labels: ['A'],
      rejected: [{ line: 3, reason: 'unknown type XY9' }],
      ignoredColumns: ['colour'],
    });
    (await nextRequest()).flush(page([]));
    await fixture.whenStable();
    const report = element().querySelector('.import-report')!.textContent!;
    expect(report).toMatch(/1\s+row rejected/);
    expect(report).toContain('unknown type XY9');
    expect(report).toContain('colour');
  });

  it('hides the import and new-record actions from viewers', async () => {
    await render('viewer');
    expect(element().querySelector('input[type=file]')).toBeNull();
    expect(element().textContent).not.toContain('New record');
    expect(element().textContent).toContain('Export CSV');
  });
});
