/** A project's team (members of the firm) and its invited clients; owners and engineers edit the team. */
import { Alert, Autocomplete, Button, Chip, Paper, Stack, TextField, Typography } from '@mui/material';
import { useState } from 'react';
import { ROLE_LABELS, useMembers } from '../../members';
import type { Role } from '../../auth';
import { useProjectPeople } from '../api/get-project-people';
import { useSetProjectMembers } from '../api/set-project-members';

export function ProjectPeople({ projectId, canEdit }: { projectId: string; canEdit: boolean }) {
  const people = useProjectPeople(projectId);
  const members = useMembers();
  const setMembers = useSetProjectMembers(projectId);
  const [editing, setEditing] = useState(false);
  const [chosen, setChosen] = useState<string[]>([]);
  const firm = (members.data ?? []).filter((m) => m.roles.some((r) => r !== 'client'));
  const team = people.data?.members ?? [];
  return (
    <Paper component="section" aria-label="Project people" sx={{ p: 2 }}>
      <Stack direction="row" spacing={1} sx={{ alignItems: 'center', mb: 1 }}>
        <Typography variant="h4" component="h2">
          Team
        </Typography>
        {canEdit && !editing && (
          <Button size="small" onClick={() => (setChosen(team.map((t) => t.id)), setEditing(true))}>
            Change the team
          </Button>
        )}
      </Stack>
      {people.isError && <Alert severity="error">{people.error.message}</Alert>}
      {!editing && (
        <Stack direction="row" spacing={1} sx={{ flexWrap: 'wrap', rowGap: 1 }} data-testid="project-team">
          {team.map((m) => (
            <Chip key={m.id} label={`${m.name} (${m.roles.map((r) => ROLE_LABELS[r as Role] ?? r).join(', ')})`} />
          ))}
          {people.isSuccess && team.length === 0 && (
            <Typography variant="body2" color="text.secondary">
              No one named yet.
            </Typography>
          )}
        </Stack>
      )}
      {editing && (
        <Stack direction={{ xs: 'column', sm: 'row' }} spacing={1} sx={{ alignItems: { sm: 'center' } }}>
          <Autocomplete
            multiple
            sx={{ minWidth: 360 }}
            options={firm.map((m) => m.user.id)}
            value={chosen}
            onChange={(_, v) => setChosen(v)}
            getOptionLabel={(id) => firm.find((m) => m.user.id === id)?.user.name ?? id}
            renderInput={(params) => <TextField {...params} size="small" label="Members of the firm on this project" />}
          />
          <Button variant="contained" disabled={setMembers.isPending} onClick={() => setMembers.mutate(chosen, { onSuccess: () => setEditing(false) })}>
            Save the team
          </Button>
          <Button onClick={() => setEditing(false)}>Cancel</Button>
        </Stack>
      )}
      {setMembers.isError && (
        <Alert severity="error" sx={{ mt: 1 }}>
          {setMembers.error.message}
        </Alert>
      )}
      <Typography variant="h4" component="h2" sx={{ mt: 2, mb: 1 }}>
        Invited clients
      </Typography>
      <Typography variant="body2" color={people.data?.clients.length ? 'text.primary' : 'text.secondary'}>
        {people.data?.clients.length
          ? people.data.clients.map((c) => `${c.name} <${c.email}>`).join('; ')
          : 'None yet: the owner invites clients to this project from Members.'}
      </Typography>
    </Paper>
  );
}
