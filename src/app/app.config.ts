import { ApplicationConfig, provideBrowserGlobalErrorListeners } from '@angular/core';
import { provideHttpClient, withFetch, withInterceptors, withXsrfConfiguration } from '@angular/common/http';
import { provideRouter, withComponentInputBinding, withInMemoryScrolling } from '@angular/router';

import { routes } from './app.routes';
import { loadingInterceptor } from './core/loading/loading-interceptor';
import { sessionInterceptor } from './core/auth/session-interceptor';

export const appConfig: ApplicationConfig = {
  providers: [
    provideBrowserGlobalErrorListeners(),
    provideRouter(routes, withComponentInputBinding(), withInMemoryScrolling({ scrollPositionRestoration: 'top' })),
    // Default cookie/header names: XSRF-TOKEN cookie, X-XSRF-TOKEN header. The fetch backend
    // streams response text (live evaluation's server-sent events) and supports keepalive.
    provideHttpClient(withFetch(), withXsrfConfiguration({}), withInterceptors([loadingInterceptor, sessionInterceptor])),
  ],
};
