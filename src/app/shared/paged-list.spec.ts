import { Component, provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { Subject, throwError, type Observable } from 'rxjs';
import { pagedList, type ListPage, type PageQuery } from './paged-list';

interface Query extends PageQuery {
  status: string;
}

describe('pagedList', () => {
  const answers: { query: Query; subject: Subject<ListPage<string>> }[] = [];
  let failNext = false;
  const load = (query: Query): Observable<ListPage<string>> => {
    if (failNext) return throwError(() => new Error('down'));
    const subject = new Subject<ListPage<string>>();
    answers.push({ query, subject });
    return subject;
  };

  @Component({ selector: 'app-host', template: '' })
  class Host {
    readonly list = pagedList<Query, string>(
      { page: 3, pageSize: 10, status: '' },
      load,
      'Loading failed.',
    );
  }

  async function host() {
    TestBed.configureTestingModule({ providers: [provideZonelessChangeDetection()] });
    const fixture = TestBed.createComponent(Host);
    await fixture.whenStable();
    return { list: fixture.componentInstance.list, fixture };
  }

  beforeEach(() => {
    answers.length = 0;
    failNext = false;
  });

  it('keeps the newest query’s page when an older answer arrives late', async () => {
    const { list, fixture } = await host();
    expect(list.loading()).toBe(true);
    list.refine({ status: 'complete' });
    await fixture.whenStable();
    expect(answers.map((a) => a.query)).toEqual([
      { page: 3, pageSize: 10, status: '' },
      { page: 1, pageSize: 10, status: 'complete' },
    ]);
    answers[1].subject.next({ items: ['new'], total: 1 });
    answers[0].subject.next({ items: ['old'], total: 1 });
    expect(list.rows()).toEqual(['new']);
    expect(list.loading()).toBe(false);
  });

  it('goes to the paginator’s page and says why a load failed', async () => {
    const { list, fixture } = await host();
    failNext = true;
    list.changePage({ pageIndex: 4, pageSize: 50, length: 500 });
    await fixture.whenStable();
    expect(list.query()).toEqual({ page: 5, pageSize: 50, status: '' });
    expect(list.error()).toBe('Loading failed.');
    expect(list.loading()).toBe(false);
  });
});
