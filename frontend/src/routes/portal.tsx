import { Alert, Paper, Table, TableBody, TableCell, TableHead, TableRow, Typography } from '@mui/material';
import { CautionNotice } from '../components/layout/caution-notice';
import { PageHeading } from '../components/layout/page-heading';
import { monoFont } from '../app/theme';
import { PackageLink, usePortal } from '../features/packages';

/** For clients: the issued revisions of the projects they were invited to, with their signed packages. */
export function PortalPage() {
  const list = usePortal();
  return (
    <>
      <PageHeading overline="For clients">Client portal</PageHeading>
      {list.isError && <Alert severity="error">{list.error.message}</Alert>}
      <Paper sx={{ mb: 2, overflowX: 'auto' }}>
        <Table size="small" aria-label="Issued packages">
          <TableHead>
            <TableRow>
              <TableCell>Project</TableCell>
              <TableCell>Sheet</TableCell>
              <TableCell>Revision</TableCell>
              <TableCell>Issued</TableCell>
              <TableCell>Checked and approved by</TableCell>
              <TableCell>Package</TableCell>
            </TableRow>
          </TableHead>
          <TableBody>
            {list.data?.map((r) => (
              <TableRow key={r.id}>
                <TableCell>
                  {r.jobNumber} · {r.projectTitle}
                </TableCell>
                <TableCell>
                  {r.sheetNumber} · {r.sheetTitle}
                </TableCell>
                <TableCell>
                  <strong>{r.code}</strong>
                </TableCell>
                <TableCell>{new Date(r.issuedAt).toLocaleString()}</TableCell>
                <TableCell>
                  {r.checkedBy}; {r.approvedBy}
                </TableCell>
                <TableCell>
                  <PackageLink revisionId={r.id} />
                  <Typography variant="caption" sx={{ display: 'block', fontFamily: monoFont }} title={r.pdfSha256 ?? ''}>
                    {r.pdfSha256 ? `SHA-256 ${r.pdfSha256.slice(0, 16)}…` : ''}
                  </Typography>
                </TableCell>
              </TableRow>
            ))}
            {list.data?.length === 0 && (
              <TableRow>
                <TableCell colSpan={6}>
                  <Typography color="text.secondary">No package has been issued to you yet.</Typography>
                </TableCell>
              </TableRow>
            )}
          </TableBody>
        </Table>
      </Paper>
      <CautionNotice />
    </>
  );
}
