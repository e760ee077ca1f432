import { Box } from '@mui/material';

/**
 * A chart drawn by common/plot. The SVG text is built by our own code with every label escaped
 * (common/src/plot/svg.ts), so it is safe to put into the page as it is.
 */
export function SvgFigure({ svg, label }: { svg: string; label: string }) {
  return (
    <Box
      component="figure"
      role="figure"
      aria-label={label}
      sx={{ m: 0, my: 1, maxWidth: '100%', '& svg': { maxWidth: '100%', height: 'auto' } }}
      dangerouslySetInnerHTML={{ __html: svg }}
    />
  );
}
