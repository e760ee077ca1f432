import { Box, type BoxProps } from '@mui/material';
import { useLayoutEffect, useRef, useState } from 'react';

/**
 * A box that scrolls sideways when its content is wider than it (a long formula, a source line, a chart on
 * a phone). While it does, it can be focused and named, so it can be scrolled from the keyboard too
 * (WCAG 2.1.1); while it does not, it is no stop on the way through the page.
 */
export function ScrollBox({ label, sx, children, ...rest }: BoxProps & { label: string }) {
  const ref = useRef<HTMLElement>(null);
  const [scrolls, setScrolls] = useState(false);
  useLayoutEffect(() => {
    const el = ref.current;
    if (!el) return;
    const check = () => setScrolls(el.scrollWidth > el.clientWidth + 1);
    check();
    if (typeof ResizeObserver === 'undefined') return;
    const observer = new ResizeObserver(check);
    observer.observe(el);
    return () => observer.disconnect();
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
