import { HttpErrorResponse, type HttpInterceptorFn } from '@angular/common/http';
import { inject } from '@angular/core';
import { Router } from '@angular/router';
import { catchError, throwError } from 'rxjs';
import { Auth } from './auth';

const LOGIN_URL = '/api/auth/login';

/**
 * Adds the bearer token to hub API requests (only /api, so icons and other assets never carry
 * it), and sends the user to sign-in when the hub answers 401 to a signed-in request.
 */
export const authInterceptor: HttpInterceptorFn = (req, next) => {
  const auth = inject(Auth);
  const router = inject(Router);
  const isApi = req.url.startsWith('/api/');
  const token = auth.token();
  const outgoing =
    isApi && token ? req.clone({ setHeaders: { Authorization: `Bearer ${token}` } }) : req;
  return next(outgoing).pipe(
    catchError((err: unknown) => {
      if (
        isApi &&
        req.url !== LOGIN_URL &&
        err instanceof HttpErrorResponse &&
        err.status === 401
      ) {
        auth.signOut();
        const returnUrl = router.url.startsWith('/sign-in') ? undefined : router.url;
        void router.navigate(['/sign-in'], { queryParams: { returnUrl } });
      }
      return throwError(() => err);
    }),
  );
};
