import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, TestRequest, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import type { GroupRole, Page, WorksheetSummaryDto } from '@shared/api';
import { WorksheetTable } from './worksheet-table';

const page = (items: WorksheetSummaryDto[], total = items.length): Page<WorksheetSummaryDto> => ({
  items,
  total,
  page: 0,
  pageSize: 10,
});
const ws = (id: number, title: string): WorksheetSummaryDto => ({
  id,
  title,
  version: 2,
  updatedAt: '2026-03-01T10:00:00Z',
  updatedBy: 'Noor Amsel',
});

describe('WorksheetTable', () => {
  let http: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({
      imports: [WorksheetTable],
      providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
    http = TestBed.inject(HttpTestingController);
  });

  afterEach(() => http.verify());

  async function create(role: GroupRole): Promise<ComponentFixture<WorksheetTable>> {
    const fixture = TestBed.createComponent(WorksheetTable);
    fixture.componentRef.setInput('groupId', 5);
    fixture.componentRef.setInput('role', role);
    await fixture.whenStable();
    return fixture;
  }

  function expectList(): TestRequest {
    return http.expectOne((r) => r.url === '/api/groups/5/worksheets');
  }

  function params(req: TestRequest): Record<string, string | null> {
    const p = req.request.params;
    return Object.fromEntries(p.keys().map((k) => [k, p.get(k)]));
  }

  it('asks for the first page, newest first, and links each row to its worksheet', async () => {
    const fixture = await create('reader');
    const req = expectList();
    expect(params(req)).toEqual({ search: '', sort: 'updatedAt', direction: 'desc', page: '0', pageSize: '10' });
    req.flush(page([ws(11, 'Two coupled modes'), ws(12, 'Time-sliced propagator')]));
    await fixture.whenStable();
    const links = [...(fixture.nativeElement as HTMLElement).querySelectorAll('a[data-testid="worksheet-link"]')];
    expect(links.map((a) => a.getAttribute('href'))).toEqual(['/worksheets/11', '/worksheets/12']);
    expect(links[0].textContent).toContain('Two coupled modes');
  });

  it('sends sort, filter and page to the server', async () => {
    const fixture = await create('author');
    expectList().flush(page([ws(1, 'A')], 42));
    await fixture.whenStable();
    const el = fixture.nativeElement as HTMLElement;

    // Sort by title: click the header.
    el.querySelector<HTMLElement>('th.mat-column-title .mat-sort-header-container')!.click();
    await fixture.whenStable();
    let req = expectList();
    expect(params(req)).toMatchObject({ sort: 'title', direction: 'asc', page: '0' });
    req.flush(page([ws(1, 'A')], 42));
    await fixture.whenStable();

    // Next page.
    el.querySelector<HTMLButtonElement>('button.mat-mdc-paginator-navigation-next')!.click();
    await fixture.whenStable();
    req = expectList();
    expect(params(req)).toMatchObject({ sort: 'title', direction: 'asc', page: '1', pageSize: '10' });
    req.flush(page([ws(2, 'B')], 42));
    await fixture.whenStable();

    // Filter (Enter applies at once) returns to the first page.
    const filter = el.querySelector<HTMLInputElement>('input[data-testid="worksheet-filter"]')!;
    filter.value = 'fresnel';
    filter.dispatchEvent(new KeyboardEvent('keydown', { key: 'Enter' }));
    await fixture.whenStable();
    req = expectList();
    expect(params(req)).toMatchObject({ search: 'fresnel', sort: 'title', page: '0' });
    req.flush(page([]));
    await fixture.whenStable();
    expect(el.textContent).toContain('No worksheet matches “fresnel”.');
  });

  it('debounces typing in the filter box', async () => {
    const wait = (ms: number) => new Promise((r) => setTimeout(r, ms));
    const fixture = await create('reader');
    expectList().flush(page([]));
    const filter = (fixture.nativeElement as HTMLElement).querySelector<HTMLInputElement>(
      'input[data-testid="worksheet-filter"]',
    )!;
    for (const v of ['g', 'ga', 'gau']) {
      filter.value = v;
      filter.dispatchEvent(new Event('input'));
      await wait(60);
    }
    http.expectNone((r) => r.url === '/api/groups/5/worksheets');
    await wait(350);
    await fixture.whenStable();
    expect(params(expectList())).toMatchObject({ search: 'gau', page: '0' });
  });

  it('offers "New worksheet" to authors and owners only', async () => {
    for (const [role, shown] of [
      ['owner', true],
      ['author', true],
      ['reviewer', false],
      ['reader', false],
    ] as const) {
      const fixture = await create(role);
      expectList().flush(page([]));
      await fixture.whenStable();
      expect(!!(fixture.nativeElement as HTMLElement).querySelector('[data-testid="new-worksheet"]')).toBe(shown);
      fixture.destroy();
    }
  });

  it('shows the server error in plain words', async () => {
    const fixture = await create('reader');
    expectList().flush(
      { error: { code: 'forbidden', message: 'You are not a member of this group.' } },
      { status: 403, statusText: 'Forbidden' },
    );
    await fixture.whenStable();
    expect((fixture.nativeElement as HTMLElement).querySelector('[role="alert"]')?.textContent).toContain(
      'You are not a member of this group.',
    );
  });
});
