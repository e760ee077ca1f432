import { Alert, Box, Button, LinearProgress, Typography } from '@mui/material';
import { usePackageStatus } from '../api/get-package-status';
import { useRetryPackage } from '../api/retry-package';

/** The signed package of a revision: its making in progress, a download when ready, a retry if it failed. */
export function PackageLink({ revisionId, canRetry = false }: { revisionId: string; canRetry?: boolean }) {
  const status = usePackageStatus(revisionId);
  const retry = useRetryPackage(revisionId);
  const s = status.data;
  if (status.isError)
    return (
      <Typography variant="caption" color="error">
        {status.error.message}
      </Typography>
    );
  if (!s) return null;
  if (s.status === 'done') {
    return (
      <Button size="small" variant="outlined" href={`/api/revisions/${revisionId}/package`} download data-testid="package-download">
        Download the signed PDF
      </Button>
    );
  }
  if (s.status === 'failed' || s.status === 'none') {
    return (
      <Alert
        severity="error"
        sx={{ py: 0 }}
        action={
          canRetry ? (
            <Button size="small" onClick={() => retry.mutate()}>
              Try again
            </Button>
          ) : undefined
        }
      >
        The package could not be made{s.error ? `: ${s.error}` : ''}.
      </Alert>
    );
  }
  return (
    <Box sx={{ minWidth: 180 }} data-testid="package-progress">
      <Typography variant="caption">{s.status === 'queued' ? 'Waiting to make the package…' : `Making the signed package… ${s.percent} %`}</Typography>
      <LinearProgress variant={s.status === 'queued' ? 'indeterminate' : 'determinate'} value={s.percent} />
    </Box>
  );
}
