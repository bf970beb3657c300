import { inject } from '@angular/core';
import { CanActivateFn, Router } from '@angular/router';
import { catchError, map, of } from 'rxjs';
import { AuthStore } from './auth-store';

/** Signed-out users go to the sign-in page, which brings them back afterwards. */
export const authGuard: CanActivateFn = (_route, state) => {
  const auth = inject(AuthStore);
  const router = inject(Router);
  return auth.ensureLoaded().pipe(
    catchError(() => of(null)),
    map((user) =>
      user ? true : router.createUrlTree(['/sign-in'], { queryParams: { returnUrl: state.url } }),
    ),
  );
};

/** Sign-in and registration are for signed-out users; others go to their groups. */
export const guestGuard: CanActivateFn = () => {
  const auth = inject(AuthStore);
  const router = inject(Router);
  return auth.ensureLoaded().pipe(
    catchError(() => of(null)),
    map((user) => (user ? router.createUrlTree(['/groups']) : true)),
  );
};

/** Site administration is for site admins only. */
export const adminGuard: CanActivateFn = (_route, state) => {
  const auth = inject(AuthStore);
  const router = inject(Router);
  return auth.ensureLoaded().pipe(
    catchError(() => of(null)),
    map((user) => {
      if (!user) return router.createUrlTree(['/sign-in'], { queryParams: { returnUrl: state.url } });
      return user.siteRole === 'admin' ? true : router.createUrlTree(['/groups']);
    }),
  );
};
