import { CertificatePanel } from '../features/packages';
import {
  Alert,
  Button,
  Checkbox,
  Chip,
  FormControlLabel,
  FormGroup,
  FormHelperText,
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
import { FormCard } from '../components/forms/form-card';
import { useForm } from '../components/forms/use-form';
import { PageHeading } from '../components/layout/page-heading';
import { ROLES } from '@ampwright/common/review/workflow';
import { useMe, type Role } from '../features/auth';
import {
  inviteSchema,
  ROLE_LABELS,
  useInvitations,
  useInvite,
  useMembers,
  useRemoveMember,
  useRevokeInvitation,
  useUpdateRoles,
  type Member,
} from '../features/members';

const ALL_ROLES: Role[] = [...ROLES];

function RoleBoxes({ value, onChange, disabled }: { value: Role[]; onChange: (roles: Role[]) => void; disabled?: boolean }) {
  return (
    <FormGroup row>
      {ALL_ROLES.map((role) => (
        <FormControlLabel
          key={role}
          label={ROLE_LABELS[role]}
          control={
            <Checkbox
              size="small"
              checked={value.includes(role)}
              disabled={disabled}
              onChange={(e) => onChange(e.target.checked ? [...value, role] : value.filter((r) => r !== role))}
            />
          }
        />
      ))}
    </FormGroup>
  );
}

function MemberRow({ member, canManage, isSelf }: { member: Member; canManage: boolean; isSelf: boolean }) {
  const [roles, setRoles] = useState<Role[]>(member.roles);
  const update = useUpdateRoles();
  const remove = useRemoveMember();
  const changed = roles.slice().sort().join() !== member.roles.slice().sort().join();
  const error = (update.error ?? remove.error)?.message;
  return (
    <TableRow>
      <TableCell>
        <Typography sx={{ fontWeight: 600 }}>{member.user.name}</Typography>
        <Typography variant="body2" color="text.secondary">
          {member.user.email}
        </Typography>
      </TableCell>
      <TableCell>
        {canManage ? (
          <RoleBoxes value={roles} onChange={setRoles} />
        ) : (
          <Stack direction="row" spacing={0.5}>
            {member.roles.map((r) => (
              <Chip key={r} size="small" label={ROLE_LABELS[r]} />
            ))}
          </Stack>
        )}
        {error && <FormHelperText error>{error}</FormHelperText>}
      </TableCell>
      {canManage && (
        <TableCell align="right" sx={{ whiteSpace: 'nowrap' }}>
          <Button size="small" disabled={!changed || update.isPending} onClick={() => update.mutate({ id: member.id, roles })}>
            Save roles
          </Button>
          <Button
            size="small"
            color="error"
            disabled={isSelf || remove.isPending}
            onClick={() => window.confirm(`Remove ${member.user.name} from the firm?`) && remove.mutate(member.id)}
          >
            Remove
          </Button>
        </TableCell>
      )}
    </TableRow>
  );
}

function InviteForm() {
  const form = useForm(inviteSchema, { email: '', roles: ['engineer'] as Role[] });
  const invite = useInvite();
  const submit = () => {
    const body = form.validate();
    if (body) invite.mutate(body, { onSuccess: () => form.set('email', ''), onError: form.showError });
  };
  return (
    <FormCard
      title="Invite someone"
      intro="They receive an e-mail with a link to set their password. A client sees only issued packages of their projects."
      error={form.formError}
      onSubmit={submit}
      actions={
        <Button type="submit" variant="contained" color="secondary" disabled={invite.isPending}>
          Send the invitation
        </Button>
      }
    >
      <TextField
        label="E-mail address"
        type="email"
        value={form.values.email}
        onChange={(e) => form.set('email', e.target.value)}
        error={!!form.errors.email}
        helperText={form.errors.email}
        required
      />
      <div>
        <RoleBoxes value={form.values.roles} onChange={(r) => form.set('roles', r)} />
        {form.errors.roles && <FormHelperText error>{form.errors.roles}</FormHelperText>}
      </div>
      {invite.isSuccess && <Alert severity="success">Invitation sent to {invite.data.email}.</Alert>}
    </FormCard>
  );
}

export function MembersPage() {
  const { data: me } = useMe();
  const isOwner = !!me?.roles.includes('owner');
  const members = useMembers();
  const invitations = useInvitations(isOwner);
  const revoke = useRevokeInvitation();
  return (
    <Stack spacing={3}>
      <PageHeading overline={me?.firm.name}>Members</PageHeading>
      {members.isError && <Alert severity="error">{members.error.message}</Alert>}
      <Paper sx={{ overflowX: 'auto' }}>
        <Table size="small" aria-label="Members">
          <TableHead>
            <TableRow>
              <TableCell>Person</TableCell>
              <TableCell>Roles</TableCell>
              {isOwner && <TableCell />}
            </TableRow>
          </TableHead>
          <TableBody>
            {members.data?.map((m) => (
              <MemberRow key={`${m.id}:${m.roles.join()}`} member={m} canManage={isOwner} isSelf={m.user.id === me?.user.id} />
            ))}
          </TableBody>
        </Table>
      </Paper>
      {isOwner && <InviteForm />}
      {isOwner && <CertificatePanel />}
      {isOwner && !!invitations.data?.length && (
        <Paper sx={{ p: 2 }}>
          <Typography variant="h4" gutterBottom>
            Invitations
          </Typography>
          {invitations.data.map((i) => {
            const open = !i.acceptedAt && !i.revokedAt && new Date(i.expiresAt) >= new Date();
            return (
              <Stack key={i.id} direction="row" spacing={1} sx={{ alignItems: 'center' }}>
                <Typography variant="body2">
                  {i.email} — {i.roles.map((r) => ROLE_LABELS[r]).join(', ')} —{' '}
                  {i.acceptedAt ? 'accepted' : i.revokedAt ? 'withdrawn' : open ? `open until ${new Date(i.expiresAt).toLocaleDateString()}` : 'expired'}
                </Typography>
                {open && (
                  <Button size="small" disabled={revoke.isPending} onClick={() => revoke.mutate(i.id)} aria-label={`Withdraw the invitation of ${i.email}`}>
                    Withdraw
                  </Button>
                )}
              </Stack>
            );
          })}
          {revoke.isError && <Alert severity="error">{revoke.error.message}</Alert>}
        </Paper>
      )}
    </Stack>
  );
}
