import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { App } from './app';
import { AuthStore } from './core/auth/auth-store';
import { LoadingTracker } from './core/loading/loading-tracker';

describe('App shell', () => {
  beforeEach(async () => {
    await TestBed.configureTestingModule({
      imports: [App],
      providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    }).compileComponents();
  });

  it('shows the product name and no account menu when signed out', async () => {
    const fixture = TestBed.createComponent(App);
    await fixture.whenStable();
    const el = fixture.nativeElement as HTMLElement;
    expect(el.querySelector('.word')?.textContent).toBe('Sheetwise');
    expect(el.querySelector('[data-testid="account-menu"]')).toBeNull();
  });

  it('shows the loading bar while a request is in flight', async () => {
    const fixture = TestBed.createComponent(App);
    const tracker = TestBed.inject(LoadingTracker);
    tracker.start();
    await fixture.whenStable();
    expect((fixture.nativeElement as HTMLElement).querySelector('[data-testid="loading"]')).not.toBeNull();
    tracker.stop();
    await fixture.whenStable();
    expect((fixture.nativeElement as HTMLElement).querySelector('[data-testid="loading"]')).toBeNull();
  });

  it('shows the account menu with the display name once signed in', async () => {
    const fixture = TestBed.createComponent(App);
    TestBed.inject(AuthStore).signIn({ email: 'a@b.test', password: 'x' }).subscribe();
    TestBed.inject(HttpTestingController)
      .expectOne('/api/auth/login')
      .flush({ user: { id: 1, email: 'a@b.test', displayName: 'Ada Field', siteRole: 'user', disabled: false } });
    await fixture.whenStable();
    // The menu is a deferred block; give it a moment to load.
    await new Promise((r) => setTimeout(r, 50));
    await fixture.whenStable();
    const button = (fixture.nativeElement as HTMLElement).querySelector('[data-testid="account-menu"]');
    expect(button?.textContent).toContain('Ada Field');
  });
});
