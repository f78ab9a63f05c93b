// The width of a chart's container, kept current with a ResizeObserver (charts fill their card).
import { useEffect, useRef, useState } from "react";

/**
 * A ref for the container element and its current width in pixels. On the server and before the
 * first measurement the width is `fallback`, so server-rendered charts have a sensible size.
 */
export function useContainerWidth<T extends HTMLElement = HTMLDivElement>(fallback = 560) {
  const ref = useRef<T>(null);
  const [width, setWidth] = useState(fallback);
  useEffect(() => {
    const el = ref.current;
    if (!el) return;
    const measure = () => {
      const w = Math.floor(el.getBoundingClientRect().width);
      if (w > 0) setWidth(w);
    };
    measure();
    const observer = new ResizeObserver(measure);
    observer.observe(el);
    return () => observer.disconnect();
  }, []);
  return { ref, width };
}
