import type { Routes } from '@angular/router';
import { adminGuard, authGuard } from './core/auth-guard';
import { MATCHING_ROUTES } from './matching/matching-routes';
import { REPORT_BARE_ROUTES, REPORT_SHELL_ROUTES } from './reports/report-routes';

/** Every page loads lazily; the shell wraps the signed-in ones. */
export const appRoutes: Routes = [
  {
    path: 'sign-in',
    title: 'Sign in · Emberline',
    loadComponent: () => import('./sign-in/sign-in').then((m) => m.SignIn),
  },
  ...REPORT_BARE_ROUTES,
  {
    path: '',
    canActivate: [authGuard],
    loadComponent: () => import('./shell/shell').then((m) => m.Shell),
    children: [
      { path: '', pathMatch: 'full', redirectTo: 'bench' },
      {
        path: 'bench',
        title: 'Bench · Emberline',
        loadComponent: () => import('./bench/bench-page').then((m) => m.BenchPage),
      },
      {
        path: 'sweeps',
        title: 'Sweeps · Emberline',
        loadComponent: () => import('./sweeps/sweep-list').then((m) => m.SweepList),
      },
      {
        path: 'sweeps/:id',
        title: 'Sweep · Emberline',
        loadComponent: () => import('./sweeps/sweep-detail').then((m) => m.SweepDetail),
      },
      {
        path: 'valves',
        title: 'Valves · Emberline',
        loadComponent: () => import('./valves/valve-list').then((m) => m.ValveList),
      },
      {
        path: 'box-check',
        title: 'Box check · Emberline',
        loadComponent: () => import('./box-check/box-check').then((m) => m.BoxCheck),
      },
      {
        path: 'valves/:id',
        title: 'Valve · Emberline',
        loadComponent: () => import('./valves/valve-record').then((m) => m.ValveRecord),
      },
      {
        path: 'types',
        title: 'Types · Emberline',
        loadComponent: () => import('./types/type-list').then((m) => m.TypeList),
      },
      {
        path: 'types/:designation',
        title: 'Type · Emberline',
        loadComponent: () => import('./types/type-detail').then((m) => m.TypeDetail),
      },
      {
        path: 'settings',
        title: 'Settings · Emberline',
        canActivate: [adminGuard],
        loadComponent: () =>
          import('./settings/workshop-settings').then((m) => m.WorkshopSettings),
      },
      ...MATCHING_ROUTES,
      ...REPORT_SHELL_ROUTES,
    ],
  },
  { path: '**', redirectTo: '' },
];
