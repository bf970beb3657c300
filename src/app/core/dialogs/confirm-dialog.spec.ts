import { TestBed } from '@angular/core/testing';
import { firstValueFrom } from 'rxjs';
import { Confirmer } from './confirmer';

describe('Confirmer', () => {
  const overlay = (selector: string) => document.querySelector<HTMLElement>(`.cdk-overlay-container ${selector}`);

  beforeEach(() => document.querySelector('.cdk-overlay-container')?.replaceChildren());

  async function ask(danger: boolean) {
    const answer = firstValueFrom(
      TestBed.inject(Confirmer).ask({ title: 'Delete this file?', message: 'Delete the file “a.pdf”?', confirm: 'Delete', danger }),
    );
    await new Promise((r) => setTimeout(r));
    return answer;
  }

  it('shows the question in a dialog and answers true on the confirming button', async () => {
    const answer = ask(true);
    await new Promise((r) => setTimeout(r));
    expect(overlay('[data-testid="confirm-dialog"]')).not.toBeNull();
    expect(overlay('h2')!.textContent).toContain('Delete this file?');
    expect(overlay('[data-testid="confirm-message"]')!.textContent).toContain('a.pdf');
    expect(overlay('[data-testid="confirm-accept"]')!.textContent).toContain('Delete');
    expect(overlay('[data-testid="confirm-accept"]')!.classList).toContain('danger');
    overlay('[data-testid="confirm-accept"]')!.click();
    expect(await answer).toBe(true);
  });

  it('answers false on cancel, the safe button that comes first', async () => {
    const answer = ask(false);
    await new Promise((r) => setTimeout(r));
    const buttons = [...document.querySelectorAll<HTMLElement>('.cdk-overlay-container mat-dialog-actions button')];
    expect(buttons[0].dataset['testid']).toBe('confirm-cancel');
    expect(buttons[0].textContent).toContain('Cancel');
    buttons[0].click();
    expect(await answer).toBe(false);
  });
});
