import { HttpInterceptorFn } from '@angular/common/http';
import { inject } from '@angular/core';
import { finalize } from 'rxjs';
import { LoadingTracker } from './loading-tracker';

export const loadingInterceptor: HttpInterceptorFn = (req, next) => {
  const tracker = inject(LoadingTracker);
  tracker.start();
  return next(req).pipe(finalize(() => tracker.stop()));
};
