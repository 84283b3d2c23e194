import { inject } from '@angular/core';
import { Router, type CanActivateFn } from '@angular/router';
import { AuthStore } from './auth-store';

/** Pages for signed-in users: others go to sign-in and come back afterwards. */
export const signedInGuard: CanActivateFn = (_route, state) => {
  const auth = inject(AuthStore);
  return auth.signedIn() ? true : inject(Router).createUrlTree(['/sign-in'], { queryParams: { next: state.url } });
};

/** Sign-in and sign-up pages: a signed-in user goes straight to their studios. */
export const signedOutGuard: CanActivateFn = () => {
  const auth = inject(AuthStore);
  return auth.signedIn() ? inject(Router).createUrlTree(['/studios']) : true;
};

/** `/`: the preferred studio's bench, or the studio list when there is none. */
export const homeRedirectGuard: CanActivateFn = () => {
  const auth = inject(AuthStore);
  const router = inject(Router);
  if (!auth.signedIn()) return router.createUrlTree(['/sign-in']);
  const studio = auth.preferredStudio();
  return studio ? router.createUrlTree(['/studios', studio.id, 'bench']) : router.createUrlTree(['/studios']);
};
