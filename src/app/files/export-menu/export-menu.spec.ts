import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { ExportMenu } from './export-menu';

describe('ExportMenu', () => {
  let http: HttpTestingController;
  beforeEach(() => {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting()] });
    http = TestBed.inject(HttpTestingController);
  });
  afterEach(() => http.verify());

  async function openMenu() {
    const fixture = TestBed.createComponent(ExportMenu);
    fixture.componentRef.setInput('worksheetId', 7);
    fixture.componentRef.setInput('version', 3);
    await fixture.whenStable();
    (fixture.nativeElement as HTMLElement).querySelector<HTMLButtonElement>('[data-testid="export-menu"]')!.click();
    await fixture.whenStable();
    return fixture;
  }
  const item = (id: string) => document.querySelector<HTMLElement>(`[data-testid="${id}"]`)!;

  it('offers the three formats as download links', async () => {
    await openMenu();
    expect(item('export-swk').getAttribute('href')).toBe('/api/worksheets/7/export?format=swk');
    expect(item('export-json').getAttribute('href')).toBe('/api/worksheets/7/export?format=json');
    expect(item('export-latex').getAttribute('href')).toBe('/api/worksheets/7/export?format=latex');
    expect(item('export-latex').hasAttribute('download')).toBe(true);
  });

  it('copies the LaTeX appendix to the clipboard', async () => {
    const fixture = await openMenu();
    const writeText = vi.fn().mockResolvedValue(undefined);
    Object.defineProperty(navigator, 'clipboard', { value: { writeText }, configurable: true });
    item('copy-latex').click();
    const req = http.expectOne('/api/worksheets/7/export?format=latex');
    expect(req.request.responseType).toBe('text');
    req.flush('\\documentclass{article}');
    await fixture.whenStable();
    await vi.waitFor(() => expect(writeText).toHaveBeenCalledWith('\\documentclass{article}'));
  });
});
