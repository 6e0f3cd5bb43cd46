// The case page's canal navigator at work: `#canal-{id}` shows that canal whole (its timeline
// and comments too), `#canals` or no address shows every canal side by side, and
// `#event-{id}` opens the canal the event belongs to at that event. Other addresses on the
// page (the sign-off, the comments) leave the choice as it is. Without this script every
// canal shows in full, one after the other, and the links still lead to each.

function choose(moved: boolean): void {
  const area = document.querySelector<HTMLElement>('[data-canal-area]');
  if (!area) return;
  const panels = [...area.querySelectorAll<HTMLElement>('[data-canal-panel]')];
  const hash = decodeURIComponent(window.location.hash.slice(1));
  let selected: string | null;
  let target: HTMLElement | null = null;
  if (hash.startsWith('canal-') && panels.some((p) => p.dataset.canalPanel === hash.slice(6))) {
    selected = hash.slice(6);
    target = document.getElementById(hash);
  } else if (hash.startsWith('event-') && document.getElementById(hash)?.closest('[data-canal-panel]')) {
    target = document.getElementById(hash);
    selected = target!.closest<HTMLElement>('[data-canal-panel]')!.dataset.canalPanel ?? null;
  } else if (hash === '' || hash === 'canals') {
    selected = null;
    if (hash === 'canals') target = area;
  } else {
    if (!area.dataset.view) area.dataset.view = 'all';
    return;
  }
  area.dataset.view = selected ? 'one' : 'all';
  for (const p of panels) p.hidden = selected !== null && p.dataset.canalPanel !== selected;
  for (const a of document.querySelectorAll<HTMLAnchorElement>('[data-canal-link]')) {
    if (a.dataset.canalLink === (selected ?? 'all')) a.setAttribute('aria-current', 'true');
    else a.removeAttribute('aria-current');
  }
  if (moved && target) {
    target.scrollIntoView({ block: 'start' });
    // A canal's heading takes the focus, so a screen reader reads where the link led.
    if (target.tabIndex >= 0 || target.hasAttribute('tabindex')) target.focus({ preventScroll: true });
  }
}

choose(window.location.hash !== '');
window.addEventListener('hashchange', () => choose(true));
