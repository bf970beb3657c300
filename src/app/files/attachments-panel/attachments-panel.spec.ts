import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { AttachmentsPanel } from './attachments-panel';
import { Confirmer } from '../../core/dialogs/confirmer';
import { of } from 'rxjs';

const csv = { id: 4, fileName: 'table.csv', mediaType: 'text/csv', size: 2048, uploadedBy: 'Tobiah Osei', createdAt: '2026-03-01T10:00:00Z' };

describe('AttachmentsPanel', () => {
  let http: HttpTestingController;
  beforeEach(() => {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting()] });
    http = TestBed.inject(HttpTestingController);
  });
  afterEach(() => http.verify());

  async function render(canEdit: boolean) {
    const fixture = TestBed.createComponent(AttachmentsPanel);
    fixture.componentRef.setInput('worksheetId', 7);
    fixture.componentRef.setInput('canEdit', canEdit);
    await fixture.whenStable();
    http.expectOne('/api/worksheets/7/attachments').flush({ attachments: [csv] });
    await fixture.whenStable();
    return { fixture, el: fixture.nativeElement as HTMLElement };
  }

  function choose(el: HTMLElement, file: File) {
    const input = el.querySelector<HTMLInputElement>('[data-testid="attach-file"]')!;
    Object.defineProperty(input, 'files', { value: [file], configurable: true });
    input.dispatchEvent(new Event('change'));
  }

  it('lists name, size and uploader with a download link; a reader gets no upload or delete', async () => {
    const { el } = await render(false);
    const row = el.querySelector('[data-testid="attachment-row"]')!;
    expect(row.textContent).toContain('table.csv');
    expect(row.textContent).toContain('2.0 kB');
    expect(row.textContent).toContain('Tobiah Osei');
    const link = row.querySelector('a')!;
    expect(link.getAttribute('href')).toBe('/api/worksheets/7/attachments/4');
    expect(link.hasAttribute('download')).toBe(true);
    expect(el.querySelector('[data-testid="attach-file"]')).toBeNull();
    expect(el.querySelector('[data-testid="attachment-delete"]')).toBeNull();
  });

  it('uploads as multipart field "file" and adds the row', async () => {
    const { fixture, el } = await render(true);
    choose(el, new File(['%PDF-1.4'], 'paper.pdf', { type: 'application/pdf' }));
    const req = http.expectOne('/api/worksheets/7/attachments');
    expect(req.request.method).toBe('POST');
    const body = req.request.body as FormData;
    expect((body.get('file') as File).name).toBe('paper.pdf');
    req.flush({ attachment: { id: 5, fileName: 'paper.pdf', mediaType: 'application/pdf', size: 8, uploadedBy: 'Me' } }, { status: 201, statusText: 'Created' });
    await fixture.whenStable();
    expect(el.querySelectorAll('[data-testid="attachment-row"]').length).toBe(2);
  });

  it('shows the server sentence for a refused type (415) and a size for a 413 without one', async () => {
    const { fixture, el } = await render(true);
    choose(el, new File(['text'], 'paper.pdf'));
    http.expectOne('/api/worksheets/7/attachments').flush(
      { error: { code: 'wrong_type', message: 'Attach a PDF, PNG, SVG, CSV or TeX file.' } },
      { status: 415, statusText: 'Unsupported Media Type' },
    );
    await fixture.whenStable();
    expect(el.querySelector('[data-testid="upload-error"]')!.textContent).toContain('paper.pdf: Attach a PDF, PNG, SVG, CSV or TeX file.');
    choose(el, new File(['x'], 'huge.pdf'));
    http.expectOne('/api/worksheets/7/attachments').flush('', { status: 413, statusText: 'Payload Too Large' });
    await fixture.whenStable();
    expect(el.querySelector('[data-testid="upload-error"]')!.textContent).toContain('larger than 10 MB');
  });

  it('deletes after asking', async () => {
    const { fixture, el } = await render(true);
    vi.spyOn(TestBed.inject(Confirmer), 'ask').mockReturnValue(of(true));
    el.querySelector<HTMLButtonElement>('[data-testid="attachment-delete"]')!.click();
    const req = http.expectOne('/api/worksheets/7/attachments/4');
    expect(req.request.method).toBe('DELETE');
    req.flush(null, { status: 204, statusText: 'No Content' });
    await fixture.whenStable();
    expect(el.querySelectorAll('[data-testid="attachment-row"]').length).toBe(0);
  });
});
