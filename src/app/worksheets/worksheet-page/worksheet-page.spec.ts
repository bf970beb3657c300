import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import type { GroupRole, WorksheetDto } from '@shared/api';
import { WorksheetPage } from './worksheet-page';

const sheet = (over: Partial<WorksheetDto> = {}): WorksheetDto => ({
  id: 7,
  groupId: 5,
  title: 'Two coupled modes',
  version: 3,
  updatedAt: '2026-03-01T10:00:00Z',
  updatedBy: 'Noor Amsel',
  source: 'param k : positive\n',
  role: 'author',
  ...over,
});

describe('WorksheetPage', () => {
  let http: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({
      imports: [WorksheetPage],
      providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
    http = TestBed.inject(HttpTestingController);
  });

  afterEach(() => http.verify());

  async function open(role: GroupRole): Promise<{ fixture: ComponentFixture<WorksheetPage>; el: HTMLElement }> {
    const fixture = TestBed.createComponent(WorksheetPage);
    fixture.componentRef.setInput('id', '7');
    await fixture.whenStable();
    http.expectOne('/api/worksheets/7').flush({ worksheet: sheet({ role }) });
    await fixture.whenStable();
    http.expectOne('/api/worksheets/7/versions').flush({ versions: [] });
    http.expectOne('/api/groups/5').flush({
      group: { id: 5, name: 'Mode integrals', role, memberCount: 4, worksheetCount: 4 },
    });
    await fixture.whenStable();
    expect(fixture.nativeElement.querySelector('[data-testid="back-to-group"]').textContent).toContain('Mode integrals');
    return { fixture, el: fixture.nativeElement as HTMLElement };
  }

  const source = (el: HTMLElement) => el.querySelector<HTMLTextAreaElement>('[data-testid="worksheet-source"]')!;
  const status = (el: HTMLElement) => el.querySelector('[data-testid="save-status"]')!.textContent!.trim();

  async function type(fixture: ComponentFixture<WorksheetPage>, el: HTMLElement, text: string) {
    source(el).value = text;
    source(el).dispatchEvent(new Event('input'));
    await fixture.whenStable();
  }

  for (const role of ['reader', 'reviewer'] as const) {
    it(`shows the source read-only to a ${role}, with no save control`, async () => {
      const { el } = await open(role);
      expect(source(el).value).toBe('param k : positive\n');
      expect(source(el).readOnly).toBe(true);
      expect(el.querySelector('[data-testid="save-worksheet"]')).toBeNull();
      expect(el.querySelector('[data-testid="delete-worksheet"]')).toBeNull();
      expect(status(el)).toBe('Read only · version 3');
    });
  }

  it('lets an author edit and save, carrying the base version', async () => {
    const { fixture, el } = await open('author');
    expect(source(el).readOnly).toBe(false);
    const save = el.querySelector<HTMLButtonElement>('[data-testid="save-worksheet"]')!;
    expect(save.disabled).toBe(true);

    await type(fixture, el, 'param k : positive\nparam lam : real\n');
    expect(status(el)).toBe('Unsaved changes · based on version 3');
    expect(fixture.componentInstance.hasUnsavedChanges()).toBe(true);
    save.click();
    await fixture.whenStable();

    const req = http.expectOne('/api/worksheets/7');
    expect(req.request.method).toBe('PUT');
    expect(req.request.body).toEqual({ source: 'param k : positive\nparam lam : real\n', baseVersion: 3 });
    req.flush({ worksheet: sheet({ version: 4, source: 'param k : positive\nparam lam : real\n' }) });
    await fixture.whenStable();
    http.expectOne('/api/worksheets/7/versions').flush({ versions: [] });
    await fixture.whenStable();
    expect(status(el)).toBe('Saved · version 4');
    expect(fixture.componentInstance.hasUnsavedChanges()).toBe(false);
  });

  it('on 409 says who saved meanwhile, keeps the text, and can save it on top', async () => {
    const { fixture, el } = await open('owner');
    await type(fixture, el, 'my text');
    fixture.componentInstance.save();
    await fixture.whenStable();
    http.expectOne('/api/worksheets/7').flush(
      {
        error: { code: 'version_conflict', message: 'Someone saved a newer version.' },
        current: sheet({ version: 5, updatedBy: 'Ilse Varga', source: 'their text' }),
      },
      { status: 409, statusText: 'Conflict' },
    );
    await fixture.whenStable();

    const panel = el.querySelector('[data-testid="save-conflict"]')!;
    expect(panel.textContent).toContain('Ilse Varga');
    expect(panel.textContent).toContain('version 5');
    expect(status(el)).toBe('Not saved: Ilse Varga saved version 5 meanwhile');
    expect(source(el).value).toBe('my text');

    el.querySelector<HTMLButtonElement>('[data-testid="save-mine"]')!.click();
    await fixture.whenStable();
    const req = http.expectOne('/api/worksheets/7');
    expect(req.request.body).toEqual({ source: 'my text', baseVersion: 5 });
    req.flush({ worksheet: sheet({ version: 6, source: 'my text' }) });
    await fixture.whenStable();
    http.expectOne('/api/worksheets/7/versions').flush({ versions: [] });
    await fixture.whenStable();
    expect(el.querySelector('[data-testid="save-conflict"]')).toBeNull();
    expect(status(el)).toBe('Saved · version 6');
  });

  it('"load theirs" shows their text and keeps the user\'s text to bring back', async () => {
    const { fixture, el } = await open('author');
    await type(fixture, el, 'my text');
    fixture.componentInstance.save();
    await fixture.whenStable();
    http.expectOne('/api/worksheets/7').flush(
      { error: { code: 'version_conflict', message: 'm' }, current: sheet({ version: 5, source: 'their text' }) },
      { status: 409, statusText: 'Conflict' },
    );
    await fixture.whenStable();

    el.querySelector<HTMLButtonElement>('[data-testid="load-theirs"]')!.click();
    await fixture.whenStable();
    http.expectOne('/api/worksheets/7/versions').flush({ versions: [] });
    await fixture.whenStable();
    expect(source(el).value).toBe('their text');
    expect(status(el)).toBe('Version 5');

    el.querySelector<HTMLButtonElement>('[data-testid="bring-back-mine"]')!.click();
    await fixture.whenStable();
    expect(source(el).value).toBe('my text');
    expect(status(el)).toBe('Unsaved changes · based on version 5');
  });

  it('shows another save failure in plain words and keeps the text', async () => {
    const { fixture, el } = await open('author');
    await type(fixture, el, 'kept');
    fixture.componentInstance.save();
    await fixture.whenStable();
    http.expectOne('/api/worksheets/7').flush(
      { error: { code: 'too_large', message: 'The worksheet is too large to save.' } },
      { status: 413, statusText: 'Payload Too Large' },
    );
    await fixture.whenStable();
    expect(status(el)).toBe('Not saved: The worksheet is too large to save.');
    expect(source(el).value).toBe('kept');
  });
});
