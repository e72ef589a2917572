import { inject } from '@angular/core';
import { Router, type CanActivateFn } from '@angular/router';
import { Auth } from './auth';

/** Lets signed-in users through; everyone else goes to sign-in and comes back afterwards. */
export const authGuard: CanActivateFn = (_route, state) => {
  const auth = inject(Auth);
  if (auth.signedIn()) return true;
  return inject(Router).createUrlTree(['/sign-in'], { queryParams: { returnUrl: state.url } });
};

/** Lets admins through; other signed-in users go to the bench, signed-out ones to sign-in. */
export const adminGuard: CanActivateFn = (route, state) => {
  const signedIn = authGuard(route, state);
  if (signedIn !== true) return signedIn;
  return inject(Auth).isAdmin() ? true : inject(Router).createUrlTree(['/bench']);
};
