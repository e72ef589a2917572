import type { Routes } from '@angular/router';

/** Signed-in pages of matching and match sets (inside the shell). */
export const MATCHING_ROUTES: Routes = [];
