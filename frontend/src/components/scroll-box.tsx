import { Box, type BoxProps } from '@mui/material';
import { useEffect, useRef, useState } from 'react';

/**
 * A box that scrolls sideways when its content is wider than it (a long formula, a source line, a chart on
 * a phone). While it does, it can be focused and named, so it can be scrolled from the keyboard too
 * (WCAG 2.1.1); while it does not, it is no stop on the way through the page.
 */
export function ScrollBox({ label, sx, children, ...rest }: BoxProps & { label: string }) {
  const ref = useRef<HTMLElement>(null);
  const observer = useRef<ResizeObserver | null>(null);
  const [scrolls, setScrolls] = useState(false);
  // Measured when the box or its content changes size, in the ResizeObserver's callback (after the browser's
  // layout), never during a render: a sheet draws hundreds of these at once, and a width read in each render
  // forced a layout for every one of them.
  useEffect(() => {
    const el = ref.current;
    if (!el || typeof ResizeObserver === 'undefined') return;
    const o = new ResizeObserver(() => setScrolls(el.scrollWidth > el.clientWidth + 1));
    observer.current = o;
    o.observe(el);
    return () => {
      o.disconnect();
      observer.current = null;
    };
  }, []);
  // The content may be new after a render (observing an element already observed does nothing).
  useEffect(() => {
    const el = ref.current;
    if (el && observer.current) for (const child of el.children) observer.current.observe(child);
  });
  return (
    <Box
      ref={ref}
      tabIndex={scrolls ? 0 : undefined}
      role={scrolls ? 'region' : undefined}
      aria-label={scrolls ? label : undefined}
      sx={{ overflowX: 'auto', ...sx }}
      {...rest}
    >
      {children}
    </Box>
  );
}
