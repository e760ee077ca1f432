import {
  Alert,
  Button,
  Chip,
  Link as MuiLink,
  MenuItem,
  Paper,
  Stack,
  Table,
  TableBody,
  TableCell,
  TableHead,
  TableRow,
  TextField,
  Typography,
} from '@mui/material';
import { useState } from 'react';
import { Link, useNavigate, useParams } from 'react-router-dom';
import { ProjectPeople, useProject } from '../features/projects';
import { FormCard } from '../components/forms/form-card';
import { useForm } from '../components/forms/use-form';
import { PageHeading } from '../components/layout/page-heading';
import { useMe } from '../features/auth';
import { newSheetSchema, STATE_LABELS, useCreateSheet, useProjectSheets, useTemplates } from '../features/sheets';

function NewSheetForm({ projectId, onDone }: { projectId: string; onDone: () => void }) {
  const navigate = useNavigate();
  const templates = useTemplates();
  const form = useForm(newSheetSchema, { number: '', title: '', templateId: '' });
  const create = useCreateSheet(projectId);
  const submit = () => {
    const body = form.validate();
    if (body) create.mutate(body, { onSuccess: (s) => navigate(`/projects/${projectId}/sheets/${s.id}`), onError: form.showError });
  };
  return (
    <FormCard
      title="New sheet"
      error={form.formError}
      onSubmit={submit}
      actions={
        <>
          <Button type="submit" variant="contained" disabled={create.isPending}>
            Create the sheet
          </Button>
          <Button onClick={onDone}>Cancel</Button>
        </>
      }
    >
      <TextField
        label="Sheet number"
        value={form.values.number}
        onChange={(e) => form.set('number', e.target.value)}
        error={!!form.errors.number}
        helperText={form.errors.number ?? 'For example C-201'}
        required
      />
      <TextField
        select
        label="Start from"
        value={form.values.templateId}
        onChange={(e) => form.set('templateId', e.target.value)}
        helperText="A template, or a blank sheet"
      >
        <MenuItem value="">Blank sheet</MenuItem>
        {templates.data?.map((t) => (
          <MenuItem key={t.id} value={t.id}>
            {t.title}
            {t.source === 'firm' ? ' (our template)' : ''}
          </MenuItem>
        ))}
      </TextField>
      <TextField
        label="Title"
        value={form.values.title}
        onChange={(e) => form.set('title', e.target.value)}
        error={!!form.errors.title}
        helperText={form.errors.title ?? "Leave empty to use the template's title"}
      />
    </FormCard>
  );
}

export function ProjectPage() {
  const { projectId = '' } = useParams();
  const { data: me } = useMe();
  const project = useProject(projectId);
  const sheets = useProjectSheets(projectId);
  const [creating, setCreating] = useState(false);
  const canCreate = !!me?.roles.some((r) => r === 'owner' || r === 'engineer');
  if (project.isError) return <Alert severity="error">{project.error.message}</Alert>;
  const p = project.data;
  return (
    <Stack spacing={2}>
      <PageHeading overline={p ? `Job ${p.jobNumber}` : 'Project'}>{p?.title ?? '…'}</PageHeading>
      {p && (
        <Typography color="text.secondary">
          {p.clientOrganisation} · {p.site}
        </Typography>
      )}
      {canCreate && !creating && (
        <Button variant="contained" color="secondary" sx={{ alignSelf: 'flex-start' }} onClick={() => setCreating(true)}>
          New sheet
        </Button>
      )}
      {creating && <NewSheetForm projectId={projectId} onDone={() => setCreating(false)} />}
      <ProjectPeople projectId={projectId} canEdit={canCreate} />
      <Paper sx={{ overflowX: 'auto' }}>
        <Table size="small" aria-label="Sheets">
          <TableHead>
            <TableRow>
              <TableCell>Sheet</TableCell>
              <TableCell>Title</TableCell>
              <TableCell>State</TableCell>
              <TableCell>Prepared by</TableCell>
              <TableCell>Open queries</TableCell>
            </TableRow>
          </TableHead>
          <TableBody>
            {sheets.data?.map((s) => (
              <TableRow key={s.id} hover>
                <TableCell>
                  <MuiLink component={Link} to={`/projects/${projectId}/sheets/${s.id}`}>
                    {s.number}
                  </MuiLink>
                </TableCell>
                <TableCell>{s.title}</TableCell>
                <TableCell>
                  <Chip size="small" label={STATE_LABELS[s.state]} />
                </TableCell>
                <TableCell>{s.preparer}</TableCell>
                <TableCell>{s.openQueries ? <Chip size="small" color="warning" label={s.openQueries} /> : '—'}</TableCell>
              </TableRow>
            ))}
            {sheets.isSuccess && sheets.data.length === 0 && (
              <TableRow>
                <TableCell colSpan={5}>No sheets yet.</TableCell>
              </TableRow>
            )}
          </TableBody>
        </Table>
      </Paper>
    </Stack>
  );
}
