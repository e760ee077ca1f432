import { Typography } from '@mui/material';
import type { ReactNode } from 'react';

export function PageHeading({ overline, children }: { overline?: string; children: ReactNode }) {
  return (
    <>
      {overline && (
        <Typography variant="overline" color="secondary">
          {overline}
        </Typography>
      )}
      <Typography variant="h1" gutterBottom>
        {children}
      </Typography>
    </>
  );
}
