/**
 * A scroll cue for boxes whose columns can sit out of view: a Svelte action that sets
 * `data-cue` on the box to `left`, `right` or `left right` while there is more to see that way
 * (styles.css draws a shadow at that edge and the box gets a title saying so). It follows
 * scrolling and every change of size of the box or its content.
 */
export function cueOf(scrollLeft: number, clientWidth: number, scrollWidth: number): string {
  const parts: string[] = [];
  if (scrollLeft > 1) parts.push('left');
  if (scrollLeft + clientWidth < scrollWidth - 1) parts.push('right');
  return parts.join(' ');
}

export function scrollCue(el: HTMLElement): { destroy(): void } {
  const update = () => {
    const cue = cueOf(el.scrollLeft, el.clientWidth, el.scrollWidth);
    if (cue) {
      el.dataset.cue = cue;
      el.title = 'More columns out of view: scroll sideways';
    } else {
      delete el.dataset.cue;
      el.removeAttribute('title');
    }
  };
  el.addEventListener('scroll', update, { passive: true });
  const ro = typeof ResizeObserver === 'undefined' ? undefined : new ResizeObserver(update);
  ro?.observe(el);
  if (el.firstElementChild) ro?.observe(el.firstElementChild);
  update();
  return {
    destroy() {
      el.removeEventListener('scroll', update);
      ro?.disconnect();
    },
  };
}
