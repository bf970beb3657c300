/**
 * The review sheet opens beside the card it reviews, never over it: docked to the side of
 * the window away from the card (the card in the right half: the sheet on the left), and
 * the card scrolled into view. On a window too narrow for both side by side (under 760 px)
 * the sheet takes the lower part of the window and the card is scrolled above it. While
 * the findings are still arriving the list's own place decides, and the card's once it is
 * there.
 */
export function placeBeside(sheet: HTMLDialogElement | null, list: HTMLElement | null | undefined, line: number, retries = 10): void {
  if (!sheet) return;
  sheet.classList.add('sw-beside');
  const card = list?.querySelector(`[data-testid="finding-card"][data-line="${line}"]`) ?? null;
  const anchor = card ?? list;
  if (!anchor) return;
  const wide = window.innerWidth >= 760;
  const rect = anchor.getBoundingClientRect();
  if (wide) {
    const side = rect.left + rect.width / 2 > window.innerWidth / 2 ? 'left' : 'right';
    sheet.setAttribute('data-side', side);
    if (card && (rect.top < 0 || rect.bottom > window.innerHeight)) card.scrollIntoView({ block: 'nearest' });
  } else {
    sheet.setAttribute('data-side', 'bottom');
    card?.scrollIntoView({ block: 'start' });
  }
  if (!card && retries > 0 && sheet.open) setTimeout(() => placeBeside(sheet, list, line, retries - 1), 300);
}
