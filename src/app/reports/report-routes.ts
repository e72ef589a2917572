import type { Routes } from '@angular/router';
import { adminGuard, authGuard } from '../core/auth-guard';

/** Signed-in pages of reports and the outbox (inside the shell). */
export const REPORT_SHELL_ROUTES: Routes = [
  {
    path: 'outbox',
    title: 'Outbox · Emberline',
    canActivate: [adminGuard],
    loadComponent: () => import('./outbox-page').then((m) => m.OutboxPage),
  },
];

/** Pages outside the shell: the printable report and the buyer's signed-out view. */
export const REPORT_BARE_ROUTES: Routes = [
  {
    path: 'match-sets/:id/report',
    title: 'Match report · Emberline',
    canActivate: [authGuard],
    loadComponent: () => import('./match-report-page').then((m) => m.MatchReportPage),
  },
  {
    // No guard: the buyer is not signed in; the token in the address is the only key.
    path: 'shared/:token',
    title: 'Match report',
    loadComponent: () => import('./shared-report-page').then((m) => m.SharedReportPage),
  },
];
