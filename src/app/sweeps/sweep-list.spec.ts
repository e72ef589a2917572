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
import { MatPaginatorHarness } from '@angular/material/paginator/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { MatSortHarness } from '@angular/material/sort/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import { provideRouter, Router } from '@angular/router';
import { sweepView } from '../../testing/fixtures';
import type { SweepPage } from '../core/sweeps-api';
import { SweepList } from './sweep-list';

describe('SweepList', () => {
  let fixture: ComponentFixture<SweepList>;
  let loader: HarnessLoader;
  let http: HttpTestingController;
  let firstParams: Record<string, string | null>;

  const page = (n: number, total = 45): SweepPage => ({
    items: Array.from({ length: 3 }, (_, i) => sweepView({ id: 100 - (n - 1) * 20 - i })),
    total,
    page: n,
    pageSize: 20,
  });

  /** The next sweeps request; it may only be sent once the triggering action has run. */
  const nextRequest = (): Promise<TestRequest> =>
    vi.waitFor(() => http.expectOne((r) => r.url === '/api/sweeps'));

  const params = (req: TestRequest) =>
    Object.fromEntries(req.request.params.keys().map((k) => [k, req.request.params.get(k)]));

  beforeEach(async () => {
    TestBed.configureTestingModule({
      imports: [SweepList],
      providers: [
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        importProvidersFrom(MatIconTestingModule),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(SweepList);
    loader = TestbedHarnessEnvironment.loader(fixture);
    fixture.detectChanges();
    const first = await nextRequest();
    firstParams = params(first);
    first.flush(page(1));
    await fixture.whenStable();
  });

  afterEach(() => http.verify());

  it('asks first for page 1 of 20, newest first, and shows the rows', async () => {
    expect(firstParams).toEqual({ page: '1', pageSize: '20', sort: 'createdAt', order: 'desc' });
    const table = await loader.getHarness(MatTableHarness);
    const rows = await table.getRows();
    expect(rows).toHaveLength(3);
    expect(await rows[0].getCellTextByColumnName()).toMatchObject({
      id: '100',
      valveType: '12AX7',
    });
    const paginator = await loader.getHarness(MatPaginatorHarness);
    expect(await paginator.getRangeLabel()).toBe('1 – 20 of 45');
  });

  it('requests the next page when the paginator moves on', async () => {
    const paginator = await loader.getHarness(MatPaginatorHarness);
    // Start the action, flush what it requests, then await it; the other order hangs.
    const moved = paginator.goToNextPage();
    const req = await nextRequest();
    expect(params(req)).toEqual({ page: '2', pageSize: '20', sort: 'createdAt', order: 'desc' });
    req.flush(page(2));
    await moved;
    expect(await paginator.getRangeLabel()).toBe('21 – 40 of 45');
  });

  it('requests a new page size from page 1', async () => {
    const paginator = await loader.getHarness(MatPaginatorHarness);
    const moved = paginator.goToNextPage();
    (await nextRequest()).flush(page(2));
    await moved;
    const resized = paginator.setPageSize(50);
    const req = await nextRequest();
    expect(params(req)).toMatchObject({ page: '1', pageSize: '50' });
    req.flush({ ...page(1), pageSize: 50 });
    await resized;
  });

  it('sorts on the server when a column header is clicked, back on page 1', async () => {
    const paginator = await loader.getHarness(MatPaginatorHarness);
    const moved = paginator.goToNextPage();
    (await nextRequest()).flush(page(2));
    await moved;

    const sort = await loader.getHarness(MatSortHarness);
    const [typeHeader] = await sort.getSortHeaders({ label: 'Type' });
    const clicked = typeHeader.click();
    const req = await nextRequest();
    expect(params(req)).toEqual({ page: '1', pageSize: '20', sort: 'valveType', order: 'asc' });
    req.flush(page(1));
    await clicked;

    const again = typeHeader.click();
    const second = await nextRequest();
    expect(params(second)).toMatchObject({ sort: 'valveType', order: 'desc' });
    second.flush(page(1));
    await again;
  });

  it('filters by status on the server', async () => {
    const select = await loader.getHarness(MatSelectHarness);
    await select.open();
    const chosen = select.clickOptions({ text: 'Tripped' });
    const req = await nextRequest();
    expect(params(req)).toMatchObject({ status: 'limit', page: '1' });
    req.flush({ ...page(1), total: 1 });
    await chosen;
  });

  it('opens a sweep when its row is clicked', async () => {
    const navigate = vi.spyOn(TestBed.inject(Router), 'navigate').mockResolvedValue(true);
    const row = (fixture.nativeElement as HTMLElement).querySelector('tr.row') as HTMLElement;
    row.click();
    expect(navigate).toHaveBeenCalledWith(['/sweeps', 100]);
  });
});
