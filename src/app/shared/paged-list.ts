import { computed, signal, type Signal, type WritableSignal } from '@angular/core';
import { takeUntilDestroyed, toObservable } from '@angular/core/rxjs-interop';
import type { PageEvent } from '@angular/material/paginator';
import { catchError, EMPTY, switchMap, tap, type Observable } from 'rxjs';
import { apiErrorMessage } from '../core/api-error-message';

/** What every paged query has. */
export interface PageQuery {
  page: number;
  pageSize: number;
}

/** One page of a list as the hub answers. */
export interface ListPage<T> {
  items: T[];
  total: number;
}

/** A server-paged list: its query, the page the hub gave for it, and how loading went. */
export interface PagedList<Q extends PageQuery, T> {
  query: WritableSignal<Q>;
  result: Signal<ListPage<T> | null>;
  rows: Signal<T[]>;
  loading: Signal<boolean>;
  /** Why the last load failed; a page may put its other failures in the same place. */
  error: WritableSignal<string | null>;
  /** Goes to a page of the paginator (and its page size). */
  changePage(event: PageEvent): void;
  /** Changes filters or sorting; the list starts again on page 1. */
  refine(change: Partial<Omit<Q, 'page'>>): void;
}

/**
 * Loads a page for every change of the query, newest change winning (an older answer arriving
 * late is dropped), with the hub's error in words. Call in an injection context: the loading
 * stops when the component is destroyed.
 */
export function pagedList<Q extends PageQuery, T>(
  initial: Q,
  load: (query: Q) => Observable<ListPage<T>>,
  failure: string,
): PagedList<Q, T> {
  const query = signal(initial);
  const result = signal<ListPage<T> | null>(null);
  const loading = signal(false);
  const error = signal<string | null>(null);
  toObservable(query)
    .pipe(
      tap(() => loading.set(true)),
      switchMap((q) =>
        load(q).pipe(
          catchError((err: unknown) => {
            error.set(apiErrorMessage(err, failure));
            loading.set(false);
            return EMPTY;
          }),
        ),
      ),
      takeUntilDestroyed(),
    )
    .subscribe((page) => {
      loading.set(false);
      error.set(null);
      result.set(page);
    });
  return {
    query,
    result: result.asReadonly(),
    rows: computed(() => result()?.items ?? []),
    loading: loading.asReadonly(),
    error,
    changePage: (event) =>
      query.update((q) => ({ ...q, page: event.pageIndex + 1, pageSize: event.pageSize })),
    refine: (change) => query.update((q) => ({ ...q, ...change, page: 1 })),
  };
}
