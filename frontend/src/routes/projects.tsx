import { Alert, Button, Link as MuiLink, Paper, Stack, Table, TableBody, TableCell, TableHead, TableRow, TableSortLabel, TextField } from '@mui/material';
import { useMemo, useState } from 'react';
import { Link, useNavigate } from 'react-router-dom';
import { FormCard } from '../components/forms/form-card';
import { useForm } from '../components/forms/use-form';
import { PageHeading } from '../components/layout/page-heading';
import { useMe } from '../features/auth';
import { projectSchema, useCreateProject, useProjects, type Project } from '../features/projects';

type SortKey = 'jobNumber' | 'title' | 'clientOrganisation' | 'updatedAt';

function NewProjectForm({ onDone }: { onDone: () => void }) {
  const navigate = useNavigate();
  const form = useForm(projectSchema, { jobNumber: '', title: '', clientOrganisation: '', site: '' });
  const create = useCreateProject();
  const submit = () => {
    const body = form.validate();
    if (body)
      create.mutate(body, {
        onSuccess: (p) => {
          onDone();
          navigate(`/projects/${p.id}`);
        },
        onError: form.showError,
      });
  };
  const field = (key: 'jobNumber' | 'title' | 'clientOrganisation' | 'site', label: string) => (
    <TextField
      key={key}
      label={label}
      value={form.values[key]}
      onChange={(e) => form.set(key, e.target.value)}
      error={!!form.errors[key]}
      helperText={form.errors[key]}
      required
    />
  );
  return (
    <FormCard
      title="New project"
      error={form.formError}
      onSubmit={submit}
      actions={
        <>
          <Button type="submit" variant="contained" disabled={create.isPending}>
            Create the project
          </Button>
          <Button onClick={onDone}>Cancel</Button>
        </>
      }
    >
      {field('jobNumber', 'Job number')}
      {field('title', 'Title')}
      {field('clientOrganisation', 'Client organisation')}
      {field('site', 'Site')}
    </FormCard>
  );
}

export function ProjectsPage() {
  const { data: me } = useMe();
  const projects = useProjects();
  const [filter, setFilter] = useState('');
  const [sort, setSort] = useState<{ key: SortKey; desc: boolean }>({ key: 'jobNumber', desc: false });
  const [creating, setCreating] = useState(false);
  const canCreate = !!me?.roles.some((r) => r === 'owner' || r === 'engineer');
  // A client is told nothing of the firm's internal work (drafts, open queries): those columns are members' only.
  const internal = !!me?.roles.some((r) => r !== 'client');
  const rows = useMemo(() => {
    const f = filter.trim().toLowerCase();
    const list = (projects.data ?? []).filter((p) => !f || [p.jobNumber, p.title, p.clientOrganisation, p.site].some((v) => v.toLowerCase().includes(f)));
    return list.sort((a: Project, b: Project) => (a[sort.key] < b[sort.key] ? -1 : a[sort.key] > b[sort.key] ? 1 : 0) * (sort.desc ? -1 : 1));
  }, [projects.data, filter, sort]);
  const header = (key: SortKey, label: string) => (
    <TableCell sortDirection={sort.key === key ? (sort.desc ? 'desc' : 'asc') : false}>
      <TableSortLabel
        active={sort.key === key}
        direction={sort.key === key && sort.desc ? 'desc' : 'asc'}
        onClick={() => setSort({ key, desc: sort.key === key ? !sort.desc : false })}
      >
        {label}
      </TableSortLabel>
    </TableCell>
  );
  return (
    <Stack spacing={2}>
      <PageHeading overline={me?.firm.name}>Projects</PageHeading>
      <Stack direction="row" spacing={2} sx={{ alignItems: 'center' }}>
        <TextField size="small" label="Filter" value={filter} onChange={(e) => setFilter(e.target.value)} />
        {canCreate && !creating && (
          <Button variant="contained" color="secondary" onClick={() => setCreating(true)}>
            New project
          </Button>
        )}
      </Stack>
      {creating && <NewProjectForm onDone={() => setCreating(false)} />}
      {projects.isError && <Alert severity="error">{projects.error.message}</Alert>}
      <Paper sx={{ overflowX: 'auto' }}>
        <Table size="small" aria-label="Projects">
          <TableHead>
            <TableRow>
              {header('jobNumber', 'Job')}
              {header('title', 'Title')}
              {header('clientOrganisation', 'Client')}
              {internal && <TableCell>Sheets</TableCell>}
              {internal && <TableCell>Open queries</TableCell>}
              {header('updatedAt', 'Updated')}
            </TableRow>
          </TableHead>
          <TableBody>
            {rows.map((p) => (
              <TableRow key={p.id} hover>
                <TableCell>
                  <MuiLink component={Link} to={`/projects/${p.id}`}>
                    {p.jobNumber}
                  </MuiLink>
                </TableCell>
                <TableCell>{p.title}</TableCell>
                <TableCell>{p.clientOrganisation}</TableCell>
                {internal && <TableCell>{p.sheetCount}</TableCell>}
                {internal && <TableCell data-testid="project-open-queries">{p.openQueries || '—'}</TableCell>}
                <TableCell>{new Date(p.updatedAt).toLocaleDateString()}</TableCell>
              </TableRow>
            ))}
            {projects.isSuccess && rows.length === 0 && (
              <TableRow>
                <TableCell colSpan={6}>{filter ? 'No project matches the filter.' : 'No projects yet.'}</TableCell>
              </TableRow>
            )}
          </TableBody>
        </Table>
      </Paper>
    </Stack>
  );
}
