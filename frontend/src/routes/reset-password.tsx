import { Alert, Button, Link as MuiLink, TextField } from '@mui/material';
import { Link, useSearchParams } from 'react-router-dom';
import { FormCard } from '../components/forms/form-card';
import { useForm } from '../components/forms/use-form';
import { MIN_PASSWORD_LENGTH, resetSchema, useResetPassword } from '../features/auth';

export function ResetPasswordPage() {
  const [params] = useSearchParams();
  const form = useForm(resetSchema, { token: params.get('token') ?? '', password: '' });
  const reset = useResetPassword();
  const submit = () => {
    const body = form.validate();
    if (body) reset.mutate(body, { onError: form.showError });
  };
  if (reset.isSuccess) {
    return (
      <Alert severity="success">
        Your password is changed and every other session is signed out.{' '}
        <MuiLink component={Link} to="/sign-in">
          Sign in
        </MuiLink>
      </Alert>
    );
  }
  return (
    <FormCard
      page
      title="Choose a new password"
      error={form.formError ?? form.errors.token}
      onSubmit={submit}
      actions={
        <Button type="submit" variant="contained" disabled={reset.isPending}>
          Change the password
        </Button>
      }
    >
      <TextField
        label="New password"
        type="password"
        autoComplete="new-password"
        value={form.values.password}
        onChange={(e) => form.set('password', e.target.value)}
        error={!!form.errors.password}
        helperText={form.errors.password || `At least ${MIN_PASSWORD_LENGTH} characters`}
        required
        autoFocus
      />
    </FormCard>
  );
}
