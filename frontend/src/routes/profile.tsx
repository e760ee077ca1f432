import { Alert, Button, Chip, Stack, TextField, Typography } from '@mui/material';
import { FormCard } from '../components/forms/form-card';
import { useForm } from '../components/forms/use-form';
import { PageHeading } from '../components/layout/page-heading';
import { profileSchema, useMe, useUpdateProfile } from '../features/auth';
import { ROLE_LABELS } from '../features/members';

export function ProfilePage() {
  const { data: me } = useMe();
  const form = useForm(profileSchema, { name: me?.user.name ?? '' });
  const update = useUpdateProfile();
  if (!me) return null;
  const submit = () => {
    const body = form.validate();
    if (body) update.mutate(body, { onError: form.showError });
  };
  return (
    <Stack spacing={2}>
      <PageHeading overline={me.firm.name}>Your profile</PageHeading>
      <Typography>{me.user.email}</Typography>
      <Stack direction="row" spacing={1}>
        {me.roles.map((r) => (
          <Chip key={r} label={ROLE_LABELS[r]} size="small" />
        ))}
      </Stack>
      <FormCard
        title="Name"
        error={form.formError}
        onSubmit={submit}
        actions={
          <Button type="submit" variant="contained" disabled={update.isPending}>
            Save
          </Button>
        }
      >
        <TextField
          label="Your name"
          value={form.values.name}
          onChange={(e) => form.set('name', e.target.value)}
          error={!!form.errors.name}
          helperText={form.errors.name}
          required
        />
        {update.isSuccess && <Alert severity="success">Saved.</Alert>}
      </FormCard>
    </Stack>
  );
}
