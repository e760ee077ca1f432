import { Alert, Button, CircularProgress, Stack, TextField } from '@mui/material';
import type { ReactNode } from 'react';
import { PageHeading } from '../components/layout/page-heading';
import { useNavigate, useSearchParams } from 'react-router-dom';
import { FormCard } from '../components/forms/form-card';
import { useForm } from '../components/forms/use-form';
import { acceptSchema, MIN_PASSWORD_LENGTH, useAcceptInvitation, useInvitationPreview } from '../features/auth';

export function AcceptInvitationPage() {
  const [params] = useSearchParams();
  const token = params.get('token') ?? '';
  const navigate = useNavigate();
  const preview = useInvitationPreview(token);
  const form = useForm(acceptSchema, { token, name: '', password: '' });
  const accept = useAcceptInvitation();
  const submit = () => {
    const body = form.validate();
    if (body) accept.mutate(body, { onSuccess: () => navigate(preview.data?.roles.includes('client') ? '/portal' : '/projects'), onError: form.showError });
  };
  // Until the form can be shown, the page still says what it is.
  const alone = (body: ReactNode) => (
    <Stack spacing={2}>
      <PageHeading>Accept an invitation</PageHeading>
      {body}
    </Stack>
  );
  if (token.length < 20) return alone(<Alert severity="error">This invitation link is not complete. Open the link from the e-mail again.</Alert>);
  if (preview.isPending) return alone(<CircularProgress aria-label="Loading" />);
  if (preview.isError) return alone(<Alert severity="error">{preview.error.message}</Alert>);
  const p = preview.data;
  return (
    <FormCard
      page
      title={`Join ${p.firm}`}
      intro={`${p.email} is invited as ${p.roles.join(', ')}. ${p.hasAccount ? 'Enter the password of your existing account to accept.' : 'Choose a password to accept.'}`}
      error={form.formError}
      onSubmit={submit}
      actions={
        <Button type="submit" variant="contained" disabled={accept.isPending}>
          Accept the invitation
        </Button>
      }
    >
      <TextField
        label="Your name"
        autoComplete="name"
        value={form.values.name}
        onChange={(e) => form.set('name', e.target.value)}
        error={!!form.errors.name}
        helperText={form.errors.name}
        required
        autoFocus
      />
      <TextField
        label="Password"
        type="password"
        autoComplete={p.hasAccount ? 'current-password' : 'new-password'}
        value={form.values.password}
        onChange={(e) => form.set('password', e.target.value)}
        error={!!form.errors.password}
        helperText={form.errors.password || `At least ${MIN_PASSWORD_LENGTH} characters`}
        required
      />
    </FormCard>
  );
}
