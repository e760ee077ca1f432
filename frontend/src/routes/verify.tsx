import { Alert, Button, Paper, Stack, Typography } from '@mui/material';
import { useRef } from 'react';
import { PageHeading } from '../components/layout/page-heading';
import { useVerify } from '../features/packages';

/** Anyone, signed in or not, can check whether a PDF is an unaltered package issued through Ampwright. */
export function VerifyPage() {
  const verify = useVerify();
  const input = useRef<HTMLInputElement>(null);
  const v = verify.data;
  return (
    <>
      <PageHeading overline="Anyone">Verify a package</PageHeading>
      <Paper sx={{ p: 3 }}>
        <Stack spacing={2}>
          <Typography>
            Choose a PDF calculation package to learn whether it is exactly as its firm issued it through Ampwright. The file is checked and not kept.
          </Typography>
          <Button variant="contained" sx={{ alignSelf: 'flex-start' }} onClick={() => input.current?.click()} disabled={verify.isPending}>
            Choose a PDF…
          </Button>
          <input
            ref={input}
            type="file"
            accept="application/pdf,.pdf"
            hidden
            data-testid="verify-input"
            onChange={(e) => {
              const f = e.target.files?.[0];
              e.target.value = '';
              if (f) verify.mutate(f);
            }}
          />
          {verify.isPending && <Typography>Checking…</Typography>}
          {verify.isError && (
            <Alert severity="error" data-testid="verdict">
              {verify.error.message}
            </Alert>
          )}
          {v?.verdict === 'unaltered' && (
            <Alert severity="success" data-testid="verdict">
              An unaltered package: {v.project} (job {v.jobNumber}), sheet {v.sheet} “{v.sheetTitle}”, revision {v.revision}, issued on{' '}
              {new Date(v.issuedAt).toLocaleDateString()} by {v.firm}.
            </Alert>
          )}
          {v && v.verdict !== 'unaltered' && (
            <Alert severity={v.verdict === 'altered' ? 'error' : 'warning'} data-testid="verdict">
              {v.message}
            </Alert>
          )}
        </Stack>
      </Paper>
    </>
  );
}
