import { Button, Link as MuiLink, TextField } from '@mui/material';
import { Link, useNavigate, useSearchParams } from 'react-router-dom';
import { FormCard } from '../components/forms/form-card';
import { useForm } from '../components/forms/use-form';
import { signInSchema, useSignIn } from '../features/auth';

/** Only paths of this app may follow sign-in (no open redirect). */
export const safeNext = (next: string | null) => (next && next.startsWith('/') && !next.startsWith('//') ? next : '/projects');

export function SignInPage() {
  const [params] = useSearchParams();
  const navigate = useNavigate();
  const form = useForm(signInSchema, { email: '', password: '' });
  const signIn = useSignIn();
  const submit = () => {
    const body = form.validate();
    if (body)
      signIn.mutate(body, { onSuccess: (me) => navigate(me.roles.includes('client') ? '/portal' : safeNext(params.get('next'))), onError: form.showError });
  };
  return (
    <FormCard
      page
      title="Sign in"
      intro={params.get('next') ? 'Sign in to continue where you were.' : undefined}
      error={form.formError}
      onSubmit={submit}
      actions={
        <>
          <Button type="submit" variant="contained" disabled={signIn.isPending}>
            Sign in
          </Button>
          <MuiLink component={Link} to="/forgot-password">
            Forgot your password?
          </MuiLink>
          <MuiLink component={Link} to="/register">
            Register a firm
          </MuiLink>
        </>
      }
    >
      <TextField
        label="E-mail address"
        type="email"
        autoComplete="username"
        value={form.values.email}
        onChange={(e) => form.set('email', e.target.value)}
        error={!!form.errors.email}
        helperText={form.errors.email}
        required
        autoFocus
      />
      <TextField
        label="Password"
        type="password"
        autoComplete="current-password"
        value={form.values.password}
        onChange={(e) => form.set('password', e.target.value)}
        error={!!form.errors.password}
        helperText={form.errors.password}
        required
      />
    </FormCard>
  );
}
