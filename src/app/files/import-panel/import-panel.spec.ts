import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { Router, provideRouter } from '@angular/router';
import { FIXTURE_REPORT } from '../../worksheets/testing/report-fixture';
import { ImportPanel } from './import-panel';

describe('ImportPanel', () => {
  let http: HttpTestingController;
  beforeEach(() => {
    TestBed.configureTestingModule({ providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()] });
    http = TestBed.inject(HttpTestingController);
  });
  afterEach(() => http.verify());

  async function chooseFile() {
    const fixture = TestBed.createComponent(ImportPanel);
    fixture.componentRef.setInput('groupId', 5);
    await fixture.whenStable();
    const el = fixture.nativeElement as HTMLElement;
    el.querySelector<HTMLButtonElement>('[data-testid="open-import"]')!.click();
    await fixture.whenStable();
    const input = el.querySelector<HTMLInputElement>('[data-testid="import-file"]')!;
    Object.defineProperty(input, 'files', { value: [new File(['param k : positive\n'], 'one-mode.swk')], configurable: true });
    input.dispatchEvent(new Event('change'));
    return { fixture, el };
  }

  it('shows the preview with each statement ok or in error, then saves and opens the new worksheet', async () => {
    const { fixture, el } = await chooseFile();
    const req = http.expectOne('/api/groups/5/imports');
    expect(((req.request.body as FormData).get('file') as File).name).toBe('one-mode.swk');
    req.flush({ preview: { title: 'one-mode', source: 'x', report: FIXTURE_REPORT } });
    await fixture.whenStable();
    expect(el.querySelector<HTMLInputElement>('[data-testid="import-title"]')!.value).toBe('one-mode');
    const rows = [...el.querySelectorAll<HTMLElement>('[data-testid="import-statement"]')];
    expect(rows.length).toBe(4);
    expect(rows[1].textContent).toContain('ok');
    expect(rows[3].textContent).toContain('error');
    expect(el.textContent).toContain('1 with a problem');

    const title = el.querySelector<HTMLInputElement>('[data-testid="import-title"]')!;
    title.value = 'One mode, imported';
    title.dispatchEvent(new Event('input'));
    const navigate = vi.spyOn(TestBed.inject(Router), 'navigate').mockResolvedValue(true);
    el.querySelector<HTMLButtonElement>('[data-testid="import-save"]')!.click();
    const save = http.expectOne('/api/groups/5/imports?save=1');
    expect((save.request.body as FormData).get('title')).toBe('One mode, imported');
    save.flush({ worksheet: { id: 42, title: 'One mode, imported', version: 1 }, report: FIXTURE_REPORT }, { status: 201, statusText: 'Created' });
    await fixture.whenStable();
    expect(navigate).toHaveBeenCalledWith(['/worksheets', 42]);
  });

  it('says why a file is refused', async () => {
    const { fixture, el } = await chooseFile();
    http.expectOne('/api/groups/5/imports').flush(
      { error: { code: 'not_text', message: 'The file is not UTF-8 text. Save it as UTF-8 and import it again.' } },
      { status: 415, statusText: 'Unsupported Media Type' },
    );
    await fixture.whenStable();
    expect(el.querySelector('[data-testid="import-error"]')!.textContent).toContain('not UTF-8 text');
    expect(el.querySelector('[data-testid="import-save"]')).toBeNull();
  });
});
