import { useEffect, useRef, useState } from "react";

/**
 * Width of an element in CSS px, following resizes (bench tablet rotated, print preview).
 * `initial` is the width before the first layout (0: "not laid out yet", so a caller can wait;
 * a guess lets an SVG chart draw at once); `min` is the narrowest width ever reported.
 */
export function useWidth<T extends HTMLElement>({ initial = 0, min = 0 }: { initial?: number; min?: number } = {}) {
  const ref = useRef<T>(null);
  const [width, setWidth] = useState(initial);
  useEffect(() => {
    const el = ref.current;
    if (!el) return;
    const update = () => setWidth(Math.max(min, Math.floor(el.clientWidth)));
    update();
    const observer = new ResizeObserver(update);
    observer.observe(el);
    return () => observer.disconnect();
    // Read once per element: the bounds are constants of the calling chart.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, []);
  return [ref, width] as const;
}
