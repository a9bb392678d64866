import { useCallback, useEffect, useState } from 'react';

/**
 * The rendered width of an element, kept current as the window resizes. Returns a callback ref,
 * so it also works for elements that appear later (after data has loaded).
 */
export function useElementWidth<T extends HTMLElement>(fallback: number) {
  const [el, setEl] = useState<T | null>(null);
  const [width, setWidth] = useState(fallback);
  const ref = useCallback((node: T | null) => setEl(node), []);
  useEffect(() => {
    if (!el) return;
    setWidth(Math.floor(el.getBoundingClientRect().width));
    const observer = new ResizeObserver(([entry]) => {
      if (entry) setWidth(Math.floor(entry.contentRect.width));
    });
    observer.observe(el);
    return () => observer.disconnect();
  }, [el]);
  return [ref, width] as const;
}
