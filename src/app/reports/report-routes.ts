import type { Routes } from '@angular/router';

/** Signed-in pages of reports and the outbox (inside the shell). */
export const REPORT_SHELL_ROUTES: Routes = [];

/** Pages outside the shell: the printable report and the buyer's signed-out view. */
export const REPORT_BARE_ROUTES: Routes = [];
