/** The documents kept with a sheet: upload with progress, list with size and SHA-256, download through the API. */
import { Alert, Box, Button, LinearProgress, Link, Paper, Stack, Table, TableBody, TableCell, TableHead, TableRow, Typography } from '@mui/material';
import { useRef, useState } from 'react';
import { monoFont } from '../../../app/theme';
import { useAttachments } from '../api/get-attachments';
import { useDeleteAttachment } from '../api/delete-attachment';
import { useUploadAttachment } from '../api/upload-attachment';

const MAX_BYTES = 25 * 1024 * 1024;

export function formatSize(bytes: number): string {
  if (bytes < 1024) return `${bytes} B`;
  if (bytes < 1024 * 1024) return `${(bytes / 1024).toFixed(1)} kB`;
  return `${(bytes / 1024 / 1024).toFixed(1)} MB`;
}

export function AttachmentsPanel({ sheetId, editable }: { sheetId: string; editable: boolean }) {
  const list = useAttachments(sheetId);
  const [progress, setProgress] = useState(0);
  const [tooLarge, setTooLarge] = useState<string | null>(null);
  const upload = useUploadAttachment(sheetId, setProgress);
  const remove = useDeleteAttachment(sheetId);
  const input = useRef<HTMLInputElement>(null);

  const onFile = (e: React.ChangeEvent<HTMLInputElement>) => {
    const file = e.target.files?.[0];
    e.target.value = '';
    if (!file) return;
    setTooLarge(null);
    upload.reset();
    // Said at once, before sending 25 MB for nothing; the server refuses it too.
    if (file.size > MAX_BYTES) return setTooLarge(`${file.name} is ${formatSize(file.size)}, larger than the 25 MB limit; nothing was stored.`);
    setProgress(0);
    upload.mutate(file);
  };

  return (
    <Paper component="section" aria-label="Attachments" sx={{ p: 2 }}>
      <Stack direction="row" spacing={2} sx={{ alignItems: 'center', mb: 1 }}>
        <Typography variant="h3" component="h2" sx={{ fontSize: '1.1rem' }}>
          Attachments
        </Typography>
        {editable && (
          <>
            <Button size="small" variant="outlined" onClick={() => input.current?.click()} disabled={upload.isPending}>
              Upload a file
            </Button>
            <input ref={input} type="file" hidden onChange={onFile} data-testid="attachment-input" />
          </>
        )}
      </Stack>
      {upload.isPending && <LinearProgress variant="determinate" value={progress * 100} aria-label="Upload progress" sx={{ mb: 1 }} />}
      {(tooLarge || upload.isError) && (
        <Alert severity="error" sx={{ mb: 1 }}>
          {tooLarge ?? upload.error?.message}
        </Alert>
      )}
      {remove.isError && (
        <Alert severity="error" sx={{ mb: 1 }}>
          {remove.error.message}
        </Alert>
      )}
      {list.isError && <Alert severity="error">{list.error.message}</Alert>}
      {list.data && list.data.length === 0 && (
        <Typography variant="body2" color="text.secondary">
          No attachments. Datasheets, drawings and site records can be kept here (PDF, images, Office documents, ZIP, CSV or text, up to 25 MB).
        </Typography>
      )}
      {list.data && list.data.length > 0 && (
        <Box sx={{ overflowX: 'auto' }}>
          <Table size="small" aria-label="Attachment list">
            <TableHead>
              <TableRow>
                <TableCell>File</TableCell>
                <TableCell>Type</TableCell>
                <TableCell align="right">Size</TableCell>
                <TableCell>SHA-256</TableCell>
                <TableCell>Uploaded</TableCell>
                {editable && <TableCell />}
              </TableRow>
            </TableHead>
            <TableBody>
              {list.data.map((a) => (
                <TableRow key={a.id}>
                  <TableCell>
                    <Link href={`/api/attachments/${a.id}/download`} download={a.fileName}>
                      {a.fileName}
                    </Link>
                  </TableCell>
                  <TableCell>{a.mediaType}</TableCell>
                  <TableCell align="right">{formatSize(a.size)}</TableCell>
                  <TableCell sx={{ fontFamily: monoFont, fontSize: 11 }} title={a.sha256}>
                    {a.sha256.slice(0, 16)}…
                  </TableCell>
                  <TableCell>
                    {a.uploadedBy ?? '—'}, {new Date(a.createdAt).toLocaleString()}
                  </TableCell>
                  {editable && (
                    <TableCell>
                      <Button size="small" color="error" onClick={() => remove.mutate(a.id)}>
                        Remove
                      </Button>
                    </TableCell>
                  )}
                </TableRow>
              ))}
            </TableBody>
          </Table>
        </Box>
      )}
    </Paper>
  );
}
