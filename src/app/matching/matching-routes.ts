import type { Routes } from '@angular/router';

/** Signed-in pages of matching and match sets (inside the shell). */
export const MATCHING_ROUTES: Routes = [
  {
    path: 'matching',
    title: 'Matching · Emberline',
    loadComponent: () => import('./matching-page').then((m) => m.MatchingPage),
  },
  {
    path: 'match-sets',
    title: 'Match sets · Emberline',
    loadComponent: () => import('./match-set-list').then((m) => m.MatchSetList),
  },
  {
    path: 'match-sets/:id',
    title: 'Match set · Emberline',
    loadComponent: () => import('./match-set-page').then((m) => m.MatchSetPage),
  },
];
