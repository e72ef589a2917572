import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { importProvidersFrom } from '@angular/core';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MatIconTestingModule } from '@angular/material/icon/testing';
import { provideRouter } from '@angular/router';
import { provideEchartsCore } from 'ngx-echarts';
import { matchReportFixture } from './match-report-fixture';
import { MatchReportPage } from './match-report-page';

describe('MatchReportPage', () => {
  let fixture: ComponentFixture<MatchReportPage>;
  let http: HttpTestingController;
  let el: HTMLElement;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      imports: [MatchReportPage],
      providers: [
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        importProvidersFrom(MatIconTestingModule),
        provideEchartsCore({ echarts: () => import('../echarts-setup') }),
      ],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(MatchReportPage);
    fixture.componentRef.setInput('id', 7);
    el = fixture.nativeElement as HTMLElement;
    await fixture.whenStable();
  });

  afterEach(() => http.verify());

  const button = (text: string) =>
    [...el.querySelectorAll<HTMLElement>('button, a')].find((b) => b.textContent!.includes(text))!;

  it('shows the report with a way back to its set, and prints it', async () => {
    http.expectOne('/api/match-sets/7/report').flush(matchReportFixture());
    await fixture.whenStable();
    expect(el.querySelector('h1')!.textContent!.trim()).toBe('Match report MS-0007');
    expect(button('Back to the set').getAttribute('href')).toBe('/match-sets/7');
    const print = vi.spyOn(window, 'print').mockImplementation(() => {});
    button('Print').click();
    expect(print).toHaveBeenCalledTimes(1);
    print.mockRestore();
  });

  it('downloads the PDF under the name the hub gives it', async () => {
    http.expectOne('/api/match-sets/7/report').flush(matchReportFixture());
    await fixture.whenStable();
    const click = vi.spyOn(HTMLAnchorElement.prototype, 'click').mockImplementation(() => {});
    vi.spyOn(URL, 'createObjectURL').mockReturnValue('blob:report');
    let saved = '';
    click.mockImplementation(function (this: HTMLAnchorElement) {
      saved = this.download;
    });
    button('Download PDF').click();
    http.expectOne('/api/match-sets/7/report.pdf').flush(new Blob(['%PDF-']), {
      headers: { 'Content-Disposition': 'attachment; filename="match-report-MS-0007.pdf"' },
    });
    expect(saved).toBe('match-report-MS-0007.pdf');
    vi.restoreAllMocks();
  });

  it('says why a report cannot be shown', async () => {
    http
      .expectOne('/api/match-sets/7/report')
      .flush(
        { error: { code: 'not_found', message: 'match_set 7 not found' } },
        { status: 404, statusText: 'Not Found' },
      );
    await fixture.whenStable();
    expect(el.querySelector('[role="alert"]')!.textContent).toContain('match_set 7 not found');
    expect(el.querySelector('app-match-report-view')).toBeNull();
  });
});
