import { ApplicationConfig, Injectable, provideBrowserGlobalErrorListeners } from '@angular/core';
import { provideHttpClient, withFetch, withInterceptors, withXsrfConfiguration } from '@angular/common/http';
import { PreloadingStrategy, provideRouter, withComponentInputBinding, withInMemoryScrolling, withPreloading, type Route } from '@angular/router';
import { Observable, of } from 'rxjs';

import { loadEarly, routes } from './app.routes';
import { loadingInterceptor } from './core/loading/loading-interceptor';
import { sessionInterceptor } from './core/auth/session-interceptor';
import { earlyResponseInterceptor } from './core/http/early-responses';

/** After the first navigation, loads the code of routes marked `data: { preload: true }` (the worksheet page), so opening one from a list does not wait for it. */
@Injectable({ providedIn: 'root' })
export class OnlyMarkedPreloading implements PreloadingStrategy {
  preload(route: Route, load: () => Observable<unknown>): Observable<unknown> {
    return route.data?.['preload'] ? load() : of(null);
  }
}

if (typeof location !== 'undefined') loadEarly(location.pathname);

export const appConfig: ApplicationConfig = {
  providers: [
    provideBrowserGlobalErrorListeners(),
    provideRouter(routes, withComponentInputBinding(), withInMemoryScrolling({ scrollPositionRestoration: 'top' }), withPreloading(OnlyMarkedPreloading)),
    // Early responses first: a GET answered from a request made before the app was up skips the rest.
    // Default cookie/header names: XSRF-TOKEN cookie, X-XSRF-TOKEN header. The fetch backend
    // streams response text (live evaluation's server-sent events) and supports keepalive.
    provideHttpClient(withFetch(), withXsrfConfiguration({}), withInterceptors([earlyResponseInterceptor, loadingInterceptor, sessionInterceptor])),
  ],
};
