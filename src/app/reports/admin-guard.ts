import { inject } from '@angular/core';
import { Router, type CanActivateFn } from '@angular/router';
import { Auth } from '../core/auth';

/** Lets admins through; anyone else signed in goes to the bench page (the API would answer 403). */
export const adminGuard: CanActivateFn = () =>
  inject(Auth).isAdmin() ? true : inject(Router).createUrlTree(['/bench']);
