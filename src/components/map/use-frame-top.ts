import { useLayoutEffect, useState, type RefObject } from 'react';

/** The page offset of an element's top edge, kept up to date on resize, so that the map can fill
 * the window below the app header whatever height it wraps to. */
export function useFrameTop(frameRef: RefObject<HTMLElement | null>, initial = 64): number {
  const [top, setTop] = useState(initial);
  useLayoutEffect(() => {
    const measure = () => frameRef.current && setTop(Math.max(0, frameRef.current.getBoundingClientRect().top + window.scrollY));
    measure();
    window.addEventListener('resize', measure);
    return () => window.removeEventListener('resize', measure);
  }, [frameRef]);
  return top;
}
