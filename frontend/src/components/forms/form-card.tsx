import { Alert, Box, Paper, Stack, Typography } from '@mui/material';
import type { FormEvent, ReactNode } from 'react';

/** A titled form on a sheet of paper: fields stacked, the general error above the actions. */
export function FormCard({
  title,
  intro,
  error,
  onSubmit,
  children,
  actions,
  page = false,
}: {
  title: string;
  /** The form is the page (sign-in, registration): its title is the page's main heading. */
  page?: boolean;
  intro?: ReactNode;
  error?: string;
  onSubmit: () => void;
  children: ReactNode;
  actions: ReactNode;
}) {
  const submit = (e: FormEvent) => {
    e.preventDefault();
    onSubmit();
  };
  return (
    <Paper component="form" noValidate onSubmit={submit} sx={{ p: 3, maxWidth: 480 }} aria-label={title}>
      <Typography variant="h2" component={page ? 'h1' : 'h2'} gutterBottom>
        {title}
      </Typography>
      {intro && (
        <Typography color="text.secondary" sx={{ mb: 2 }}>
          {intro}
        </Typography>
      )}
      <Stack spacing={2}>
        {children}
        {error && (
          <Alert severity="error" role="alert">
            {error}
          </Alert>
        )}
        <Box sx={{ display: 'flex', gap: 1, alignItems: 'center', flexWrap: 'wrap' }}>{actions}</Box>
      </Stack>
    </Paper>
  );
}
