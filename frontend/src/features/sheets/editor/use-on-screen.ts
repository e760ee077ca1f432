/** Whether an element is on screen or near it (one IntersectionObserver shared by every cell of the page). */
import { useEffect, useState, type RefObject } from 'react';

const watchers = new Map<Element, (on: boolean) => void>();
let observer: IntersectionObserver | null = null;

function observe(element: Element, set: (on: boolean) => void): () => void {
  observer ??= new IntersectionObserver((entries) => entries.forEach((e) => watchers.get(e.target)?.(e.isIntersecting)), { rootMargin: '300px 0px' });
  watchers.set(element, set);
  observer.observe(element);
  return () => {
    watchers.delete(element);
    observer?.unobserve(element);
  };
}

/** True until the element is known to be off screen (so a cell never waits to be drawn for the first time). */
export function useOnScreen(ref: RefObject<Element | null>): boolean {
  const [on, setOn] = useState(true);
  useEffect(() => (ref.current && typeof IntersectionObserver !== 'undefined' ? observe(ref.current, setOn) : undefined), [ref]);
  return on;
}
